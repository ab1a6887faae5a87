import * as Comlink from 'comlink';
import demoDesign from '../../../fixtures/demo/adapter-two-stage.design.json';
import demoScanUrl from '../../../fixtures/scans/invented-adapter-no-filter.csv?url';
import { deflateCodec } from '../../client/compression.ts';
import { PlannerResults } from '../../client/planner-results.ts';
import { createScanImportWorkerClient } from '../../client/scan-import-client.ts';
import { Autosave } from '../../client/storage/autosave.ts';
import { PlannerDatabase } from '../../client/storage/planner-db.ts';
import { svgToPngBlob } from '../drawing/svg-to-png.ts';
import { parseJsonText } from '../../io/json-text.ts';
import { decodeText } from '../../io/text-bytes.ts';
import { encodeShareLink, readShareLink } from '../../io/share-link.ts';
import { formatIssue } from '../../model/validation-error.ts';
import { asJson, isJsonObject, type JsonObject } from '../../planner/json.ts';
import { PlannerStore } from '../../planner/planner-store.ts';
import { checkDocument } from '../../planner/validation.ts';
import { activeVariant, type ScanEntry, variantName, workspaceOf } from '../../planner/workspace.ts';
import packageJson from '../../../package.json';
import type { Scan } from '../../spectrum/spectrum-types.ts';
import type { SweepApi } from '../../../workers/sweep-api.ts';
import type { ScanPanelHost } from '../emissions/scan-panel.ts';
import type { ChokepointPlanner, ExportHandler, ThemeChoice } from './chokepoint-planner.ts';
import './chokepoint-planner.ts';
import './file-actions.ts';
import { loadLaterCode, loadPlotExport } from './later-code.ts';
import type { FileActions } from './file-actions.ts';

/**
 * The page's wiring, done once: the workers, the saved work (restored, then saved after every change),
 * the share link in the address (read once, then kept in step with the design being edited), file
 * import and export, and the planner element that shows it all. Nothing here computes a number.
 */

type Notice = ChokepointPlanner['notices'][number];

const THEME_KEY = 'chokepoint-theme';
/** The link this tab last put in its own address (sessionStorage: kept over a reload, not shared with other tabs). */
const OWN_LINK_KEY = 'chokepoint-own-link';
const PROGRAM_VERSION: string = packageJson.version;

export async function startPlanner(parent: HTMLElement): Promise<ChokepointPlanner> {
  const planner = document.createElement('chokepoint-planner');
  const notices: Notice[] = [];
  const say = (notice: Notice): void => {
    notices.push(notice);
    planner.notices = [...notices];
  };

  // Workers: the engine (sweeps and analyses), and the scan reader.
  const worker = new Worker(new URL('../../../workers/sweep.worker.ts', import.meta.url), { type: 'module', name: 'chokepoint-sweep' });
  const remote = Comlink.wrap<SweepApi>(worker);
  const scanImporter = createScanImportWorkerClient();
  const scans = new Map<string, Scan>();
  const results = new PlannerResults(
    remote,
    (id) => scans.get(id),
    () => planner.resultsChanged(),
    (buffer) => void remote.reuseSweepBuffer(Comlink.transfer(buffer, [buffer])).catch(() => undefined),
  );
  worker.addEventListener('error', (event) => say({ tone: 'error', text: `The engine's worker stopped: ${event.message || 'its script could not be loaded'}. Reload the page.` }));

  // The saved work.
  let db: PlannerDatabase | undefined;
  try {
    db = await PlannerDatabase.open();
  } catch (cause) {
    say({ tone: 'error', text: `This browser will not keep the work (${cause instanceof Error ? cause.message : String(cause)}): save the design to a file before leaving.` });
  }
  let store: PlannerStore | undefined;
  let revision = 0;
  if (db) {
    const loaded = await db.load().catch((cause: unknown) => ({ kind: 'unreadable' as const, reason: cause instanceof Error ? cause.message : String(cause) }));
    if (loaded.kind === 'restored') {
      const { workspace, history, record } = loaded.result;
      revision = record.revision;
      const kept: ScanEntry[] = [];
      for (const entry of workspace.scans) {
        const stored = await db.getScan(entry.id);
        if (stored) {
          scans.set(entry.id, stored.scan);
          kept.push(entry);
        } else say({ tone: 'error', text: `The scan “${entry.name}” was not found among the saved work; load it again.` });
      }
      store = new PlannerStore({ ...workspace, scans: kept, noise: workspace.noise.kind === 'scan' && !scans.has(workspace.noise.scanId) ? { kind: 'estimate' } : workspace.noise }, { history });
      for (const text of loaded.notices) say({ tone: 'error', text });
    } else if (loaded.kind === 'unreadable') {
      say({ tone: 'error', text: `The saved work could not be read (${loaded.reason}); it was kept aside as a backup in this browser, and the invented demo is shown.` });
    }
  }
  store ??= new PlannerStore(workspaceOf(demoDesign as unknown as JsonObject, 'demo', true));

  // A design in the link opens as a new variant beside the saved work, never over it: at start, and
  // when a link is pasted into the address of the open page (a hashchange; our own replaceState fires none).
  const openLink = async (hash: string): Promise<void> => {
    // The address this tab last wrote itself (a reload keeps it): the saved work is as new or newer.
    if (hash !== '' && hash === sessionStorage.getItem(OWN_LINK_KEY)) return;
    const fromLink = await readShareLink(hash, deflateCodec);
    if (fromLink.status === 'invalid') {
      say({ tone: 'error', text: 'The design in the link cannot be used, so nothing was opened from it.', details: fromLink.error.issues.map(formatIssue) });
    } else if (fromLink.status === 'found') {
      const checked = asJson(fromLink.document);
      const linked = checked.ok && isJsonObject(checked.value) ? checked.value : undefined;
      const text = JSON.stringify(linked);
      const same = linked && store.workspace.variants.find((v) => JSON.stringify(v.document) === text || (v.validDocument !== undefined && JSON.stringify(v.validDocument) === text));
      if (same) store.dispatch({ type: 'switch-variant', id: same.id });
      else if (linked) {
        store.dispatch({ type: 'open-design', document: linked, origin: 'link', label: 'open a design from a link' });
        say({ tone: 'info', text: `Opened “${fromLink.design.name}” from the link as a new variant; the work saved before is still here (see Variants).` });
      }
    }
  };
  await openLink(window.location.hash);
  window.addEventListener('hashchange', () => void openLink(window.location.hash));

  if (db) {
    const autosave = new Autosave(db, store, `tab-${Math.random().toString(36).slice(2, 10)}`, revision, {
      conflict: () =>
        say({
          tone: 'error',
          text: 'This work was changed in another tab since this one last saved, so this tab stopped saving to avoid overwriting it. Reload to continue with the other tab’s work, or keep editing here and save the design to a file.',
        }),
      error: (message) => say({ tone: 'error', text: message }),
    });
    autosave.start();
    // Save what has changed since the last state of this page, before the page can go away.
    const flush = (): void => void autosave.flush();
    window.addEventListener('pagehide', flush);
    document.addEventListener('visibilitychange', () => {
      if (document.visibilityState === 'hidden') flush();
    });
    planner.autosave = autosave;
  }

  // The link follows the design being edited.
  let linkTimer: ReturnType<typeof setTimeout> | undefined;
  let linkTooLong = false;
  const followLink = (): void => {
    clearTimeout(linkTimer);
    linkTimer = setTimeout(() => {
      const active = activeVariant(store.workspace);
      const document = active.validDocument ?? active.document;
      void encodeShareLink(document, deflateCodec).then((link) => {
        if (link.ok) {
          history.replaceState(null, '', `${window.location.pathname}${window.location.search}${link.hash}`);
          sessionStorage.setItem(OWN_LINK_KEY, link.hash);
          linkTooLong = false;
        } else if (!linkTooLong) {
          linkTooLong = true;
          history.replaceState(null, '', `${window.location.pathname}${window.location.search}`);
          say({ tone: 'info', text: `The address no longer carries the design: ${link.reason}.` });
        }
      });
    }, 400);
  };
  store.subscribe((change) => {
    if (change.cause !== 'view') followLink();
  });
  followLink();

  let demoScan: Promise<string> | undefined;
  const demoScanText = (): Promise<string> => {
    demoScan ??= fetch(demoScanUrl).then((response) => {
      if (!response.ok) throw new Error(`the page's server answered ${response.status}`);
      return response.text();
    });
    // A failed fetch is tried again next time.
    demoScan.catch(() => (demoScan = undefined));
    return demoScan;
  };
  // Soon after start, once the first plot has had the machine: what later actions need, so that they
  // work offline too (the demo scan, the scan reader, export and report code).
  setTimeout(() => {
    void demoScanText().catch(() => undefined);
    scanImporter.start();
    loadLaterCode();
    void remote.loadReportCode();
  }, 1500);

  // Scans: read in the worker, kept in memory and in the saved work.
  let scanCount = 0;
  const scanHost: ScanPanelHost = {
    importScan: (text, options, onProgress) => scanImporter.importScan(text, options, onProgress),
    // A file beside the page (not a script), fetched from the page's own origin once, soon after start,
    // so that it is there when asked for even if the network has gone since.
    demoScanText: () => demoScanText(),
    async keepScan(scan, invented) {
      scanCount += 1;
      const id = `scan-${Date.now().toString(36)}-${scanCount}`;
      const entry: ScanEntry = {
        id,
        name: scan.name,
        tag: scan.tag,
        points: scan.frequencyHz.length,
        detectors: scan.traces.map((t) => t.detector),
        notes: [...scan.notes],
        warnings: [...(scan.warnings ?? [])],
        rejectedLines: scan.rejected.length,
        invented,
      };
      scans.set(id, scan);
      await db?.putScan({ id, entry, scan }).catch((cause: unknown) => say({ tone: 'error', text: `The scan is loaded but could not be saved with the work: ${cause instanceof Error ? cause.message : String(cause)}` }));
      return entry;
    },
  };

  const download = (fileName: string, mimeType: string, data: BlobPart): void => {
    const url = URL.createObjectURL(new Blob([data], { type: mimeType }));
    const a = document.createElement('a');
    a.href = url;
    a.download = fileName;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
  };
  const onExport: ExportHandler = async (spec, format) => {
    const base = `${fileStem(activeVariant(store.workspace).document)}-${spec.id}`;
    let code: Awaited<ReturnType<typeof loadPlotExport>>;
    try {
      code = await loadPlotExport();
    } catch (cause) {
      say({ tone: 'error', text: `The export could not start: ${cause instanceof Error ? cause.message : String(cause)}` });
      return;
    }
    const [{ drawPlot, plotToSvg }, { plotToCsv }] = code;
    if (format === 'csv') {
      download(`${base}.csv`, 'text/csv', plotToCsv(spec));
      return;
    }
    // The picture is the SVG renderer's (as in the report), printed in the light palette; PNG paints that SVG.
    const size = { width: 960, height: 440, theme: 'light' as const };
    const svgText = plotToSvg(spec, { ...size, standalone: true });
    if (format === 'svg') download(`${base}.svg`, 'image/svg+xml', svgText);
    else {
      const { layout } = drawPlot(spec, size);
      await svgToPngBlob(svgText, layout.width, layout.height, 2).then(
        (blob) => download(`${base}.png`, 'image/png', blob),
        (cause: unknown) => say({ tone: 'error', text: `The picture could not be made: ${cause instanceof Error ? cause.message : String(cause)}` }),
      );
    }
  };

  // File actions: open and save design files, copy the link; drop a design or a scan on the page.
  const actions = document.createElement('chokepoint-file-actions') as FileActions;
  actions.slot = 'file-actions';
  const openDesignText = (text: string, fileName: string): void => {
    const json = parseJsonText(text);
    if (!json.ok) {
      say({ tone: 'error', text: `${fileName} is not valid JSON (line ${json.error.line}, column ${json.error.column}: ${json.error.message}); nothing was opened.` });
      return;
    }
    const checked = asJson(json.value);
    if (!checked.ok || !isJsonObject(checked.value)) {
      say({ tone: 'error', text: `${fileName} is not a design file; nothing was opened.` });
      return;
    }
    const valid = checkDocument(checked.value);
    if (!valid.ok) {
      say({ tone: 'error', text: `${fileName} is not a valid design; nothing was opened.`, details: valid.issues.slice(0, 20).map(formatIssue) });
      return;
    }
    store.dispatch({ type: 'open-design', document: checked.value, origin: 'file', label: `open ${fileName}` });
  };
  /** A file's text through the one decoder every way in uses: bytes that are not UTF-8 are refused, not replaced. */
  const fileText = async (file: File): Promise<string | undefined> => {
    const decoded = decodeText(new Uint8Array(await file.arrayBuffer()));
    if (decoded.ok) return decoded.text;
    say({ tone: 'error', text: `${file.name} cannot be read: ${decoded.error.message}; nothing was opened.` });
    return undefined;
  };
  const openDesignFile = async (file: File): Promise<void> => {
    const text = await fileText(file);
    if (text !== undefined) openDesignText(text, file.name);
  };
  actions.onOpenFile = openDesignFile;
  actions.onSave = () => {
    const active = activeVariant(store.workspace);
    const valid = checkDocument(active.document);
    if (!valid.ok) {
      say({ tone: 'error', text: 'The design has a value that needs a fix; the file saved holds the design as it was last valid.' });
    }
    download(`${fileStem(active.document)}.design.json`, 'application/json', `${JSON.stringify(active.validDocument ?? active.document, null, 2)}\n`);
  };
  actions.onCopyLink = async () => {
    const active = activeVariant(store.workspace);
    const link = await encodeShareLink(active.validDocument ?? active.document, deflateCodec);
    if (!link.ok) return link.reason;
    const url = `${window.location.origin}${window.location.pathname}${link.hash}`;
    try {
      await navigator.clipboard.writeText(url);
      return `Link copied (${Math.round(link.chars / 100) / 10} k characters).`;
    } catch {
      return 'The browser did not allow copying; the address bar holds the same link.';
    }
  };
  actions.onReport = async () => {
    const workspace = store.workspace;
    const active = activeVariant(workspace);
    if (!active.validDocument) return 'The design has a value that needs a fix before a report can be made.';
    const noise = await results.reportNoise(active.validDocument, workspace.noise);
    const scan = workspace.noise.kind === 'scan' ? workspace.scans.find((s) => s.id === (workspace.noise as { scanId: string }).scanId) : undefined;
    const reply = await remote.report({
      design: active.validDocument,
      ...(noise ? { noise } : {}),
      variants: workspace.variants.filter((v) => v.id !== active.id && v.validDocument).map((v) => ({ variantId: v.id, name: variantName(v).slice(0, 200), design: v.validDocument })),
      designVariantName: variantName(active).slice(0, 200),
      origin: { version: PROGRAM_VERSION, generatedAt: `${new Date().toISOString().slice(0, 16)}Z`, ...(scan ? { scanFile: scan.name.slice(0, 300) } : {}) },
    });
    if (!reply.ok) return `No report: ${reply.error.message}`;
    download(`${fileStem(active.validDocument)}.report.html`, 'text/html', reply.html);
    return `Report saved (design hash ${reply.designHash.slice(0, 12)}…).`;
  };
  planner.append(actions);
  planner.addEventListener('download-request', (event) => download(event.detail.fileName, event.detail.mimeType, event.detail.text));
  planner.addEventListener('dragover', (event) => {
    if (event.dataTransfer?.types.includes('Files')) event.preventDefault();
  });
  planner.addEventListener('drop', (event) => {
    const file = event.dataTransfer?.files[0];
    if (!file) return;
    event.preventDefault();
    if (/\.json$/iu.test(file.name)) void openDesignFile(file);
    else void planner.importScanFile(file);
  });

  const themeChoice = (localStorage.getItem(THEME_KEY) as ThemeChoice | null) ?? 'system';
  planner.themeChoice = ['system', 'light', 'dark'].includes(themeChoice) ? themeChoice : 'system';
  planner.addEventListener('theme-change', (event) => localStorage.setItem(THEME_KEY, (event as CustomEvent<{ choice: ThemeChoice }>).detail.choice));

  void remote.safetyChoiceLabels().then((labels) => (planner.choiceLabels = new Map(Object.entries(labels))));
  planner.measuredReader = (bytes, name, options) => scanImporter.importMeasuredPart(bytes, name, options);
  planner.results = results;
  planner.scanHost = scanHost;
  planner.onExport = onExport;
  planner.store = store;
  parent.append(planner);
  return planner;
}

/** A file name from the design's name: "Invented demo: 90 W adapter" → "invented-demo-90-w-adapter". */
export function fileStem(document: JsonObject): string {
  const name = typeof document['name'] === 'string' ? document['name'] : 'design';
  const stem = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/gu, '-')
    .replace(/^-+|-+$/gu, '')
    .slice(0, 60);
  return stem === '' ? 'design' : stem;
}
