import { type Complex, complex, fromPolarDeg } from './complex.ts';
import { parseDecimal, quoteField } from './decimal-number.ts';
import { type FrequencyUnit, parseFrequencyUnit, toHertz } from './frequency-unit.ts';
import { describeLines, type LineIssue, splitLines, stripByteOrderMark, type TextReadResult } from './text-issues.ts';
import { readPortComment } from './touchstone-port-comments.ts';

/**
 * Touchstone files of any number of ports, version 1 (.sNp, .yNp, .zNp; with the version 1.1 per-port
 * R on the option line) and version 2 (keyword files, usually .ts), read into per-frequency complex
 * matrices with the reference impedance of every port at every frequency. The file rules are in
 * docs/cli.md ("Touchstone files"); why a hand-written reader: DEVELOPERS.md, Decisions.
 *
 * What comes out is the network as the file means it, in SI units: S unitless, Z in ohms and Y in
 * siemens (version 1 writes Y and Z normalised to R; they are de-normalised here), matrices in
 * row-major order whatever order the file used ([Two-Port Data Order], [Matrix Format] Lower/Upper
 * are undone). Noise parameters (two-port version 1 files, a [Noise Data] block) are skipped with a
 * note. H- and G-parameters and mixed-mode data are refused by name.
 */

export type NetworkParameter = 'S' | 'Y' | 'Z';
export type TouchstoneFormat = 'RI' | 'MA' | 'DB';
export type MatrixFormat = 'full' | 'lower' | 'upper';

/** Where the reference impedances came from. */
export type ReferenceSource = 'option-line' | 'reference-keyword' | 'comments' | 'default';

export interface TouchstoneNetwork {
  /** 1 for files without keywords (1.0 and 1.1), 2 for files starting with [Version] 2.0 or 2.1. */
  readonly version: 1 | 2;
  readonly ports: number;
  readonly parameter: NetworkParameter;
  /** How the numbers were written (the values below are complex whatever it was). */
  readonly format: TouchstoneFormat;
  readonly frequencyUnit: FrequencyUnit;
  /** Line of the option line; undefined when the file has none and the defaults apply. */
  readonly optionLine: number | undefined;
  readonly referenceFrom: ReferenceSource;
  /** Strictly rising, in Hz; one entry per frequency (k = 0 … F − 1). */
  readonly frequencyHz: Float64Array;
  /** The file line where each frequency's record starts. */
  readonly lines: Int32Array;
  /** Entry (row i, column j) at frequency k, ports counted from 0, at index (k·N + i)·N + j. */
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** Reference impedance of port i at frequency k, in ohms, at index k·N + i. */
  readonly referenceRe: Float64Array;
  readonly referenceIm: Float64Array;
}

/** Entry (i, j) at frequency k (ports from 0). */
export function networkEntry(network: TouchstoneNetwork, k: number, i: number, j: number): Complex {
  const at = (k * network.ports + i) * network.ports + j;
  return complex(network.re[at]!, network.im[at]!);
}

/** Reference impedance of port i (from 0) at frequency k, in ohms. */
export function networkReference(network: TouchstoneNetwork, k: number, i: number): Complex {
  const at = k * network.ports + i;
  return complex(network.referenceRe[at]!, network.referenceIm[at]!);
}

export interface TouchstoneReadOptions {
  /** The file's name: its extension .sNp / .yNp / .zNp gives the number of ports of a version 1 file. */
  readonly fileName?: string;
}

export const TOUCHSTONE_DEFAULTS = { frequencyUnit: 'GHz', parameter: 'S', format: 'MA', referenceOhm: 50 } as const;
export const MAX_TOUCHSTONE_PORTS = 32;
export const MAX_TOUCHSTONE_FREQUENCIES = 100_000;
/** Complex entries kept at most (frequencies × ports²): bounds memory for any file. */
export const MAX_TOUCHSTONE_ENTRIES = 4_000_000;
const MAX_ISSUES = 200;

interface OptionLine {
  readonly frequencyUnit: FrequencyUnit | undefined;
  readonly parameter: NetworkParameter | undefined;
  readonly format: TouchstoneFormat | undefined;
  readonly referenceOhm: readonly Complex[] | undefined;
}

interface PortImpedanceList {
  readonly line: number;
  /** Records complete when the list was written: it belongs to the record before (0: the header). */
  readonly afterRecords: number;
  readonly numbers: number[];
}

type Phase = 'header' | 'data' | 'noise' | 'information' | 'end';

const KEYWORD = /^\[([^\]]*)\]\s*(.*)$/u;
const EXTENSION = /\.[syz](\d+)p$/iu;

export function readTouchstone(text: string, readOptions: TouchstoneReadOptions = {}): TextReadResult<TouchstoneNetwork> {
  return new TouchstoneReader(splitLines(stripByteOrderMark(text)), readOptions.fileName).read();
}

class TouchstoneReader {
  private readonly issues: LineIssue[] = [];
  private readonly notes: LineIssue[] = [];
  private version: 1 | 2 = 1;
  private phase: Phase = 'header';
  private contentSeen = false;
  private option: OptionLine | undefined;
  private optionLine: number | undefined;
  private readonly ignoredOptionLines: number[] = [];
  private readonly portsFromName: number | undefined;
  private ports: number | undefined;
  private portsLine = 0;
  private twoPortOrder: '12_21' | '21_12' | undefined;
  private matrixFormat: MatrixFormat = 'full';
  private declaredFrequencies: { count: number; line: number } | undefined;
  private reference: number[] | undefined;
  private referenceLine = 0;
  private referencePending = 0;
  private networkDataLine = 0;
  private endSeen = false;
  private structureBroken = false;
  private pending: { line: number; values: number[] } | undefined;
  private recordLength = 0;
  // Records as read: frequency in the file's unit, then the pairs as written.
  private readonly recordLines: number[] = [];
  private readonly recordValues: number[][] = [];
  private readonly portNameImpedances = new Map<number, { impedance: Complex; line: number }>();
  private readonly impedanceLists: PortImpedanceList[] = [];
  private openList: PortImpedanceList | undefined;
  private noiseSkippedFrom = 0;

  constructor(
    private readonly lines: readonly string[],
    fileName: string | undefined,
  ) {
    const extension = EXTENSION.exec(fileName ?? '');
    // Only the digit counts: tools write Z data into .s1p files as often as into .z1p.
    if (extension) this.portsFromName = Number(extension[1]);
  }

  read(): TextReadResult<TouchstoneNetwork> {
    if (this.portsFromName !== undefined && !(this.portsFromName >= 1 && this.portsFromName <= MAX_TOUCHSTONE_PORTS)) {
      return fail([{ line: 0, message: `the file name says ${this.portsFromName} ports; 1 to ${MAX_TOUCHSTONE_PORTS} are read` }]);
    }
    for (let index = 0; index < this.lines.length; index += 1) {
      if (this.issues.length >= MAX_ISSUES || this.phase === 'end') break;
      const line = index + 1;
      const raw = this.lines[index]!;
      const bang = raw.indexOf('!');
      const content = (bang >= 0 ? raw.slice(0, bang) : raw).trim();
      if (bang >= 0) this.comment(raw.slice(bang + 1), line, content === '');
      if (content === '') continue;
      this.openList = undefined;
      if (this.phase === 'information') {
        if (/^\[\s*end\s+information\s*\]/iu.test(content)) this.phase = 'header';
        continue;
      }
      if (content.startsWith('[')) this.keyword(content, line);
      else if (content.startsWith('#')) this.optionLineAt(content, line);
      else if (this.phase === 'noise') continue;
      else this.dataLine(content, line, index);
      this.contentSeen = true;
    }
    return this.finish();
  }

  // ---- comments --------------------------------------------------------------------------

  private comment(text: string, line: number, wholeLine: boolean): void {
    const found = readPortComment(text);
    if (!found) {
      this.openList = undefined;
      return;
    }
    if (found.kind === 'port-impedance-list') {
      this.openList = { line, afterRecords: this.recordValues.length, numbers: [...found.numbers] };
      this.impedanceLists.push(this.openList);
    } else if (found.kind === 'numbers') {
      // More numbers of a list written over several comment lines.
      if (this.openList && wholeLine) this.openList.numbers.push(...found.numbers);
    } else if (found.kind === 'port-impedance') {
      this.openList = undefined;
      if (!this.portNameImpedances.has(found.port)) this.portNameImpedances.set(found.port, { impedance: found.impedance, line });
    } else {
      this.openList = undefined;
      for (const [port, impedance] of found.impedances) {
        if (!this.portNameImpedances.has(port)) this.portNameImpedances.set(port, { impedance, line });
      }
    }
  }

  // ---- keywords ---------------------------------------------------------------------------

  private keyword(content: string, line: number): void {
    const match = KEYWORD.exec(content);
    if (!match) {
      this.issue(line, `${quoteField(content)} opens a keyword with "[" but has no "]"`);
      return;
    }
    const name = match[1]!.trim().replace(/\s+/gu, ' ').toLowerCase();
    const argument = match[2]!.trim();
    const shown = `[${match[1]!.trim()}]`;
    if (name === 'version') {
      if (this.contentSeen) {
        this.issue(line, '[Version] must be the first line of a Touchstone 2 file that is not a comment');
        return;
      }
      if (argument !== '2.0' && argument !== '2.1') {
        this.issue(line, `[Version] ${quoteField(argument)} is not read; Touchstone 2.0 and 2.1 are`);
        this.structureBroken = true;
        return;
      }
      this.version = 2;
      return;
    }
    if (this.version === 1) {
      this.issue(line, `${quoteField(shown)} is a Touchstone 2 keyword, but the file does not start with "[Version] 2.0"`);
      this.structureBroken = true;
      return;
    }
    if (this.referencePending > 0) {
      this.issue(this.referenceLine, `[Reference] gives ${this.reference!.length} of ${this.ports!} reference impedances`);
      this.referencePending = 0;
    }
    const inData = this.phase === 'data';
    const headerOnly = (): boolean => {
      if (inData) this.issue(line, `${shown} must come before [Network Data]`);
      return !inData;
    };
    switch (name) {
      case 'number of ports': {
        if (!headerOnly()) return;
        const count = parseWhole(argument);
        if (count === undefined || count < 1 || count > MAX_TOUCHSTONE_PORTS) {
          this.issue(line, `[Number of Ports] must be a whole number from 1 to ${MAX_TOUCHSTONE_PORTS}, got ${quoteField(argument)}`);
          this.structureBroken = true;
          return;
        }
        this.ports = count;
        this.portsLine = line;
        return;
      }
      case 'two-port data order':
        if (!headerOnly()) return;
        if (argument === '12_21' || argument === '21_12') this.twoPortOrder = argument;
        else this.issue(line, `[Two-Port Data Order] must be 12_21 or 21_12, got ${quoteField(argument)}`);
        return;
      case 'number of frequencies': {
        if (!headerOnly()) return;
        const count = parseWhole(argument);
        if (count === undefined || count < 1) this.issue(line, `[Number of Frequencies] must be a whole number above 0, got ${quoteField(argument)}`);
        else this.declaredFrequencies = { count, line };
        return;
      }
      case 'number of noise frequencies':
        headerOnly();
        return;
      case 'reference': {
        if (!headerOnly()) return;
        if (this.ports === undefined) {
          this.issue(line, '[Reference] must come after [Number of Ports]');
          return;
        }
        this.reference = [];
        this.referenceLine = line;
        this.referencePending = this.ports;
        if (argument !== '') this.referenceValues(argument, line);
        return;
      }
      case 'matrix format': {
        if (!headerOnly()) return;
        const format = argument.toLowerCase();
        if (format === 'full' || format === 'lower' || format === 'upper') this.matrixFormat = format;
        else this.issue(line, `[Matrix Format] must be Full, Lower or Upper, got ${quoteField(argument)}`);
        return;
      }
      case 'mixed-mode order':
        this.issue(line, 'mixed-mode data ([Mixed-Mode Order]) is not read; export single-ended data');
        this.structureBroken = true;
        return;
      case 'begin information':
        this.phase = 'information';
        return;
      case 'network data':
        if (!headerOnly()) return;
        this.networkDataLine = line;
        this.phase = 'data';
        this.startData(line);
        return;
      case 'noise data':
        this.closeData(line);
        this.phase = 'noise';
        this.noiseSkippedFrom = line;
        return;
      case 'end':
        this.closeData(line);
        this.endSeen = true;
        this.phase = 'end';
        return;
      default:
        this.issue(line, `unknown keyword ${quoteField(shown)}`);
    }
  }

  private referenceValues(text: string, line: number): void {
    for (const token of text.split(/\s+/u).filter((t) => t !== '')) {
      const value = parseDecimal(token);
      if (value === undefined || !(value > 0)) {
        this.issue(line, `[Reference]: ${quoteField(token)} is not a positive number of ohms`);
        this.referencePending = 0;
        return;
      }
      if (this.referencePending === 0) {
        this.issue(line, `[Reference] gives more than the ${this.ports!} reference impedances of [Number of Ports]`);
        return;
      }
      this.reference!.push(value);
      this.referencePending -= 1;
    }
  }

  // ---- option line -------------------------------------------------------------------------

  private optionLineAt(content: string, line: number): void {
    if (this.optionLine !== undefined) {
      this.ignoredOptionLines.push(line);
      return;
    }
    if (this.recordValues.length > 0 || this.pending || this.phase === 'data') {
      this.issue(line, 'the option line must come before the data');
      return;
    }
    this.optionLine = line;
    const parsed = parseOptionLine(content.slice(1));
    if (typeof parsed === 'string') {
      this.issue(line, parsed);
      this.structureBroken = true;
    } else {
      this.option = parsed;
    }
  }

  // ---- data ----------------------------------------------------------------------------------

  /** The number of ports and the record length, once the first data is reached. */
  private startData(line: number, firstDataIndex?: number): boolean {
    if (this.recordLength > 0) return true;
    if (this.version === 2) {
      if (this.ports === undefined) {
        this.issue(line, 'a Touchstone 2 file must give [Number of Ports] before [Network Data]');
        this.structureBroken = true;
        return false;
      }
      if (this.ports === 2 && this.twoPortOrder === undefined && this.matrixFormat === 'full') {
        this.issue(line, 'a 2-port Touchstone 2 file must give [Two-Port Data Order] 12_21 or 21_12; without it S12 and S21 cannot be told apart');
        this.structureBroken = true;
        return false;
      }
    } else if (this.ports === undefined) {
      const inferred = this.portsFromName ?? (firstDataIndex === undefined ? undefined : this.inferPorts(firstDataIndex));
      if (inferred === undefined) {
        this.issue(line, 'cannot tell the number of ports from the first record; name the file .s1p, .s2p, … for its number of ports');
        this.structureBroken = true;
        return false;
      }
      this.ports = inferred;
    }
    const n = this.ports;
    const entries = this.matrixFormat === 'full' ? n * n : (n * (n + 1)) / 2;
    this.recordLength = 1 + 2 * entries;
    return true;
  }

  /**
   * A version 1 file without a telling name: a record starts on a line with an odd number of values
   * (the frequency and whole pairs) and goes on over lines with even numbers, so the first record's
   * length gives N from 1 + 2·N².
   */
  private inferPorts(firstIndex: number): number | undefined {
    let total = 0;
    for (let index = firstIndex; index < this.lines.length; index += 1) {
      const raw = this.lines[index]!;
      const content = raw.replace(/!.*$/u, '').trim();
      if (content === '') continue;
      if (content.startsWith('#') || content.startsWith('[')) break;
      const count = content.split(/\s+/u).length;
      if (index === firstIndex) total = count;
      else if (count % 2 === 0) total += count;
      else break;
    }
    const pairs = (total - 1) / 2;
    const n = Math.round(Math.sqrt(pairs));
    return n >= 1 && n * n === pairs && n <= MAX_TOUCHSTONE_PORTS ? n : undefined;
  }

  private dataLine(content: string, line: number, index: number): void {
    const tokens = content.split(/\s+/u);
    const values: number[] = [];
    const bad: string[] = [];
    for (const token of tokens) {
      const value = parseDecimal(token);
      if (value === undefined) bad.push(token);
      else values.push(value);
    }
    if (bad.length > 0) {
      const shown = bad.slice(0, 5).map(quoteField).join(', ') + (bad.length > 5 ? ', …' : '');
      this.issue(line, `${shown} ${bad.length === 1 ? 'is not a number' : 'are not numbers'}`);
      this.structureBroken = true;
      return;
    }
    if (this.referencePending > 0) {
      this.referenceValues(content, line);
      return;
    }
    if (this.version === 2 && this.phase !== 'data') {
      this.issue(line, 'numbers before [Network Data]');
      this.structureBroken = true;
      return;
    }
    if (this.structureBroken) return;
    if (!this.startData(line, index)) return;
    const length = this.recordLength;

    if (!this.pending) {
      const last = this.recordValues[this.recordValues.length - 1];
      if (this.version === 1 && this.ports === 2 && values.length === 5 && last !== undefined && values[0]! <= last[0]!) {
        this.noiseSkippedFrom = line;
        this.phase = 'noise';
        return;
      }
      if (values.length % 2 === 0 || values.length > length) {
        this.issue(line, `${values.length} value${values.length === 1 ? '' : 's'}; ${this.shapeHint(values.length)}`);
        this.structureBroken = true;
        return;
      }
      this.pending = { line, values };
    } else {
      const needed = length - this.pending.values.length;
      if (values.length % 2 === 1 || values.length > needed) {
        this.issue(
          line,
          `${values.length} value${values.length === 1 ? '' : 's'} continue the record of line ${this.pending.line}, which needs ${needed} more in whole pairs${this.lookalike(this.pending.values.length)}`,
        );
        this.structureBroken = true;
        return;
      }
      this.pending.values.push(...values);
    }
    if (this.pending.values.length === length) this.completeRecord();
  }

  private completeRecord(): void {
    const { line, values } = this.pending!;
    this.pending = undefined;
    const frequency = values[0]!;
    if (frequency < 0) {
      this.issue(line, `frequency ${frequency} is negative`);
      return;
    }
    const previous = this.recordValues[this.recordValues.length - 1];
    if (previous && !(frequency > previous[0]!)) {
      const unit = this.frequencyUnit();
      this.issue(
        line,
        `frequency ${toHertz(frequency, unit)} Hz is not above the ${toHertz(previous[0]!, unit)} Hz of line ${this.recordLines[this.recordLines.length - 1]!}: Touchstone frequencies rise`,
      );
      return;
    }
    const n = this.ports!;
    if (this.recordValues.length >= MAX_TOUCHSTONE_FREQUENCIES || (this.recordValues.length + 1) * n * n > MAX_TOUCHSTONE_ENTRIES) {
      this.issue(line, `more than ${Math.min(MAX_TOUCHSTONE_FREQUENCIES, Math.floor(MAX_TOUCHSTONE_ENTRIES / (n * n)))} frequencies: a larger file is not read`);
      this.structureBroken = true;
      this.phase = 'end';
      return;
    }
    if (this.option?.format === 'MA' || (this.option?.format === undefined && TOUCHSTONE_DEFAULTS.format === 'MA')) {
      for (let v = 1; v < values.length; v += 2) {
        if (values[v]! < 0) {
          this.issue(line, `magnitude ${values[v]!} is negative (the data are magnitude and angle, MA)`);
          return;
        }
      }
    }
    this.recordLines.push(line);
    this.recordValues.push(values);
  }

  private closeData(line: number): void {
    if (this.pending && !this.structureBroken) {
      this.issue(this.pending.line, `the record starting here has ${this.pending.values.length} of ${this.recordLength} values before ${line > 0 ? `line ${line}` : 'the end'}`);
    }
    this.pending = undefined;
  }

  private shapeHint(count: number): string {
    const n = this.ports!;
    const what = `a ${n}-port record${this.matrixFormat === 'full' ? '' : ` (${this.matrixFormat} triangle)`} is a frequency and ${(this.recordLength - 1) / 2} pairs (${this.recordLength} values)`;
    if (count % 2 === 0) return `${what}; a record starts with a frequency followed by whole pairs`;
    return `${what}${this.lookalike(count)}`;
  }

  private lookalike(count: number): string {
    const other = Math.round(Math.sqrt((count - 1) / 2));
    if (other >= 1 && other !== this.ports && 1 + 2 * other * other === count) {
      return ` (this looks like a ${other}-port file${this.version === 1 ? `: name it .s${other}p` : ''})`;
    }
    return '';
  }

  private frequencyUnit(): FrequencyUnit {
    return this.option?.frequencyUnit ?? TOUCHSTONE_DEFAULTS.frequencyUnit;
  }

  private issue(line: number, message: string): void {
    if (this.issues.length < MAX_ISSUES) this.issues.push({ line, message });
  }

  // ---- the result ------------------------------------------------------------------------------

  private finish(): TextReadResult<TouchstoneNetwork> {
    if (this.referencePending > 0) this.issue(this.referenceLine, `[Reference] gives ${this.reference!.length} of ${this.ports!} reference impedances`);
    if (this.phase !== 'end') this.closeData(0);
    if (this.issues.length > 0) return fail(this.issues);
    const count = this.recordValues.length;
    if (count === 0 || this.ports === undefined) {
      return fail([{ line: 0, message: 'no data: expected records of a frequency followed by the network parameters as pairs' }]);
    }
    const n = this.ports;
    if (this.version === 2) {
      if (this.declaredFrequencies && this.declaredFrequencies.count !== count) {
        return fail([
          {
            line: this.declaredFrequencies.line,
            message: `[Number of Frequencies] says ${this.declaredFrequencies.count}, the file holds ${count}${count < this.declaredFrequencies.count ? ' (cut short?)' : ''}`,
          },
        ]);
      }
      if (!this.declaredFrequencies) return fail([{ line: this.networkDataLine, message: 'a Touchstone 2 file must give [Number of Frequencies]' }]);
      if (!this.endSeen) this.notes.push({ line: 0, message: 'no [End] keyword: check that the file is complete' });
    } else if (this.portsFromName !== undefined && this.portsFromName !== n) {
      return fail([{ line: 0, message: `the file name says ${this.portsFromName} ports but the data hold ${n}` }]);
    }
    if (this.noiseSkippedFrom > 0) this.notes.push({ line: this.noiseSkippedFrom, message: 'noise parameters from here on were skipped' });
    if (this.ignoredOptionLines.length > 0) {
      this.notes.push({ line: 0, message: `only the first option line counts; ignored ${describeLines(this.ignoredOptionLines)}` });
    }

    const option = this.option ?? { frequencyUnit: undefined, parameter: undefined, format: undefined, referenceOhm: undefined };
    const parameter = option.parameter ?? TOUCHSTONE_DEFAULTS.parameter;
    const format = option.format ?? TOUCHSTONE_DEFAULTS.format;
    const unit = option.frequencyUnit ?? TOUCHSTONE_DEFAULTS.frequencyUnit;
    this.noteDefaults(option);

    const references = this.references(option, count);
    if (typeof references === 'string') return fail([{ line: this.optionLine ?? 0, message: references }]);

    const frequencyHz = new Float64Array(count);
    const lines = Int32Array.from(this.recordLines);
    const re = new Float64Array(count * n * n);
    const im = new Float64Array(count * n * n);
    const order = entryOrder(n, this.version, this.twoPortOrder, this.matrixFormat);
    for (let k = 0; k < count; k += 1) {
      const values = this.recordValues[k]!;
      frequencyHz[k] = toHertz(values[0]!, unit);
      for (let e = 0; e < order.length; e += 1) {
        const value = toComplex(values[1 + 2 * e]!, values[2 + 2 * e]!, format);
        for (const at of order[e]!) {
          re[k * n * n + at] = value.re;
          im[k * n * n + at] = value.im;
        }
      }
    }
    // Stop at the first frequency that cannot be told apart from its neighbour once in hertz.
    for (let k = 1; k < count; k += 1) {
      if (!(frequencyHz[k]! > frequencyHz[k - 1]!)) {
        return fail([{ line: lines[k]!, message: `frequency ${frequencyHz[k]!} Hz is not above the ${frequencyHz[k - 1]!} Hz of line ${lines[k - 1]!}: Touchstone frequencies rise` }]);
      }
    }
    if (parameter !== 'S' && this.version === 1) {
      const problem = denormalise(re, im, references.re, references.im, n, parameter);
      if (problem !== undefined) return fail([{ line: lines[problem.k]!, message: problem.message }]);
    }
    const network: TouchstoneNetwork = {
      version: this.version,
      ports: n,
      parameter,
      format,
      frequencyUnit: unit,
      optionLine: this.optionLine,
      referenceFrom: references.from,
      frequencyHz,
      lines,
      re,
      im,
      referenceRe: references.re,
      referenceIm: references.im,
    };
    for (let at = 0; at < re.length; at += 1) {
      if (!Number.isFinite(re[at]!) || !Number.isFinite(im[at]!)) {
        return fail([{ line: lines[Math.floor(at / (n * n))]!, message: 'a value is too large to represent (a dB magnitude above about 6000?)' }]);
      }
    }
    return { ok: true, value: network, notes: this.notes };
  }

  private noteDefaults(option: OptionLine): void {
    const missing: string[] = [];
    if (option.frequencyUnit === undefined) missing.push(TOUCHSTONE_DEFAULTS.frequencyUnit);
    if (option.parameter === undefined) missing.push(TOUCHSTONE_DEFAULTS.parameter);
    if (option.format === undefined) missing.push(TOUCHSTONE_DEFAULTS.format);
    if (missing.length === 0) return;
    const where = this.optionLine === undefined ? 'no option line' : `the option line gives no ${missing.length === 1 ? 'value for' : 'values for'} ${missing.join(', ')}`;
    this.notes.push({
      line: this.optionLine ?? 0,
      message: `${where}: the Touchstone defaults apply (${this.optionLine === undefined ? 'GHz, S, MA' : missing.join(', ')})`,
    });
  }

  /** The reference impedance of every port at every frequency, and where it came from. */
  private references(
    option: OptionLine,
    count: number,
  ): { re: Float64Array; im: Float64Array; from: ReferenceSource } | string {
    const n = this.ports!;
    const re = new Float64Array(count * n);
    const im = new Float64Array(count * n);
    const fill = (values: readonly Complex[]): void => {
      for (let k = 0; k < count; k += 1) {
        for (let i = 0; i < n; i += 1) {
          const value = values.length === 1 ? values[0]! : values[i]!;
          re[k * n + i] = value.re;
          im[k * n + i] = value.im;
        }
      }
    };
    const fromComments = this.commentReferences(count);
    if (typeof fromComments === 'string') return fromComments;

    let from: ReferenceSource;
    let stated: readonly Complex[];
    if (this.version === 2 && this.reference !== undefined) {
      stated = this.reference.map((value) => complex(value));
      from = 'reference-keyword';
    } else if (option.referenceOhm !== undefined) {
      stated = option.referenceOhm;
      if (stated.length !== 1 && stated.length !== n) {
        return `the option line gives ${stated.length} reference impedances after R; a ${n}-port file takes 1 or ${n}`;
      }
      from = 'option-line';
    } else if (fromComments) {
      re.set(fromComments.re);
      im.set(fromComments.im);
      this.notes.push({
        line: this.optionLine ?? 0,
        message: `the file gives no reference impedance (R) ${this.optionLine === undefined ? 'in an option line' : 'on its option line'}: the port impedances stated in its comments were used (${fromComments.how}; port 1: ${formatOhm(re[0]!, im[0]!)} at the first frequency)`,
      });
      return { re, im, from: 'comments' };
    } else {
      this.notes.push({
        line: this.optionLine ?? 0,
        message: `the file gives no reference impedance (R)${this.optionLine === undefined ? '' : ' on its option line'}: the Touchstone default R 50 Ω applies; check it is the impedance the data were measured in`,
      });
      stated = [complex(TOUCHSTONE_DEFAULTS.referenceOhm)];
      from = 'default';
    }
    fill(stated);
    if (fromComments) {
      let differs = -1;
      for (let at = 0; at < re.length && differs < 0; at += 1) {
        const size = Math.hypot(fromComments.re[at]!, fromComments.im[at]!);
        if (Math.hypot(fromComments.re[at]! - re[at]!, fromComments.im[at]! - im[at]!) > 1e-9 * Math.max(size, Math.hypot(re[at]!, im[at]!))) differs = at;
      }
      if (differs >= 0) {
        const stateWhere = from === 'reference-keyword' ? '[Reference]' : from === 'default' ? 'the default R 50 Ω' : "the option line's R";
        this.notes.push({
          line: this.optionLine ?? 0,
          message: `the comments state port impedances (${fromComments.how}; port ${(differs % n) + 1}: ${formatOhm(fromComments.re[differs]!, fromComments.im[differs]!)}) other than ${stateWhere}; ${stateWhere === 'the default R 50 Ω' ? 'it' : 'those'} were used, as the Touchstone format says: check how the file was exported`,
        });
      }
    }
    return { re, im, from };
  }

  /** Reference impedances stated in comments, per frequency and port; undefined when none are. */
  private commentReferences(count: number): { re: Float64Array; im: Float64Array; how: string } | undefined | string {
    const n = this.ports!;
    const re = new Float64Array(count * n);
    const im = new Float64Array(count * n);
    const lists = this.impedanceLists.filter((list) => list.numbers.length >= 2 * n);
    if (lists.length > 0) {
      for (const list of lists) {
        if (list.numbers.length !== 2 * n) {
          return `line ${list.line}: a "Port Impedance" comment gives ${list.numbers.length} numbers; a ${n}-port file takes ${2 * n} (a real and an imaginary part per port)`;
        }
      }
      const perRecord = lists.length === count && lists.every((list, k) => list.afterRecords === k + 1);
      if (!perRecord && lists.length !== 1) {
        return `"Port Impedance" comments are given for ${lists.length} of the file's ${count} frequencies; each frequency needs one, or the header one for all`;
      }
      for (let k = 0; k < count; k += 1) {
        const numbers = (perRecord ? lists[k]! : lists[0]!).numbers;
        for (let i = 0; i < n; i += 1) {
          re[k * n + i] = numbers[2 * i]!;
          im[k * n + i] = numbers[2 * i + 1]!;
        }
      }
      return { re, im, how: perRecord ? '"Port Impedance" on each frequency' : 'a "Port Impedance" comment' };
    }
    if (this.portNameImpedances.size === 0) return undefined;
    for (let i = 0; i < n; i += 1) {
      const stated = this.portNameImpedances.get(i + 1);
      if (!stated) {
        this.notes.push({ line: 0, message: `the comments state the impedance of some ports but not of port ${i + 1}; they were not used` });
        return undefined;
      }
      for (let k = 0; k < count; k += 1) {
        re[k * n + i] = stated.impedance.re;
        im[k * n + i] = stated.impedance.im;
      }
    }
    const first = [...this.portNameImpedances.values()].map((s) => s.line);
    return { re, im, how: `comments on ${describeLines([...new Set(first)].sort((a, b) => a - b))}` };
  }
}

/** For each value pair of a record, the matrix positions (i·N + j) it fills. */
function entryOrder(n: number, version: 1 | 2, twoPortOrder: '12_21' | '21_12' | undefined, format: MatrixFormat): number[][] {
  const order: number[][] = [];
  if (format === 'full') {
    if (n === 2 && (version === 1 || twoPortOrder === '21_12')) return [[0], [2], [1], [3]];
    for (let i = 0; i < n; i += 1) for (let j = 0; j < n; j += 1) order.push([i * n + j]);
    return order;
  }
  for (let i = 0; i < n; i += 1) {
    const [from, to] = format === 'lower' ? [0, i] : [i, n - 1];
    for (let j = from; j <= to; j += 1) order.push(i === j ? [i * n + j] : [i * n + j, j * n + i]);
  }
  return order;
}

function toComplex(a: number, b: number, format: TouchstoneFormat): Complex {
  if (format === 'RI') return complex(a, b);
  if (format === 'MA') return fromPolarDeg(a, b);
  return fromPolarDeg(10 ** (a / 20), b);
}

/**
 * Version 1 writes Z and Y normalised to the reference: Z/R, Y·R. That is defined for one real R per
 * frequency shared by every port; anything else is refused rather than guessed.
 */
function denormalise(
  re: Float64Array,
  im: Float64Array,
  referenceRe: Float64Array,
  referenceIm: Float64Array,
  n: number,
  parameter: 'Y' | 'Z',
): { k: number; message: string } | undefined {
  const count = referenceRe.length / n;
  for (let k = 0; k < count; k += 1) {
    const r = referenceRe[k * n]!;
    for (let i = 0; i < n; i += 1) {
      if (referenceIm[k * n + i] !== 0 || referenceRe[k * n + i] !== r || !(r > 0)) {
        return {
          k,
          message: `version 1 ${parameter}-parameters are normalised to one real reference impedance shared by every port; this file's differ by port or are complex, so the values cannot be de-normalised`,
        };
      }
    }
    const factor = parameter === 'Z' ? r : 1 / r;
    for (let at = k * n * n; at < (k + 1) * n * n; at += 1) {
      re[at]! *= factor;
      im[at]! *= factor;
    }
  }
  return undefined;
}

function parseOptionLine(text: string): OptionLine | string {
  const tokens = text.trim().split(/\s+/u).filter((token) => token !== '');
  let frequencyUnit: FrequencyUnit | undefined;
  let parameter: NetworkParameter | undefined;
  let format: TouchstoneFormat | undefined;
  let referenceOhm: Complex[] | undefined;
  for (let i = 0; i < tokens.length; i += 1) {
    const token = tokens[i]!;
    const upper = token.toUpperCase();
    const unit = parseFrequencyUnit(token);
    if (unit) {
      if (frequencyUnit) return `option line: frequency unit given twice (${frequencyUnit} and ${token})`;
      frequencyUnit = unit;
    } else if (upper === 'S' || upper === 'Y' || upper === 'Z') {
      if (parameter) return `option line: parameter type given twice (${parameter} and ${upper})`;
      parameter = upper;
    } else if (upper === 'H' || upper === 'G') {
      return `option line: ${upper}-parameters are not read; export S-, Y- or Z-parameters`;
    } else if (upper === 'RI' || upper === 'MA' || upper === 'DB') {
      if (format) return `option line: data format given twice (${format} and ${upper})`;
      format = upper;
    } else if (upper === 'R') {
      if (referenceOhm) return 'option line: R given twice';
      referenceOhm = [];
      for (let value = readReference(tokens[i + 1]); value !== undefined; value = readReference(tokens[i + 1])) {
        if (typeof value === 'string') return value;
        referenceOhm.push(value);
        i += 1;
      }
      if (referenceOhm.length === 0) {
        return `option line: R must be followed by the reference impedance in ohms, got ${tokens[i + 1] === undefined ? 'nothing' : quoteField(tokens[i + 1]!)}`;
      }
    } else {
      return `option line: unknown option ${quoteField(token)} (expected a unit Hz/kHz/MHz/GHz, a parameter S/Y/Z, a format RI/MA/DB and R <ohms>)`;
    }
  }
  return { frequencyUnit, parameter, format, referenceOhm };
}

const PARENTHESISED_COMPLEX = /^\(([+-]?[\d.]+(?:e[+-]?\d+)?)([+-][\d.]+(?:e[+-]?\d+)?)j\)$/iu;

/**
 * A reference impedance after R: a positive number, or a complex one in parentheses as some
 * libraries write it ("(50+50j)"); undefined when the token is none, a message when it is wrong.
 */
function readReference(token: string | undefined): Complex | string | undefined {
  if (token === undefined) return undefined;
  const real = parseDecimal(token);
  if (real !== undefined) return real > 0 ? complex(real) : `option line: a reference impedance must be positive, got ${quoteField(token)}`;
  const parts = PARENTHESISED_COMPLEX.exec(token);
  if (!parts) return undefined;
  const value = complex(Number(parts[1]), Number(parts[2]));
  if (!Number.isFinite(value.re) || !Number.isFinite(value.im)) return `option line: ${quoteField(token)} is not a reference impedance`;
  return value;
}

function parseWhole(text: string): number | undefined {
  return /^\d{1,9}$/u.test(text) ? Number(text) : undefined;
}

/** "50 Ω", "49.69 − j0.112 Ω". */
export function formatOhm(re: number, im: number): string {
  const real = Number(re.toPrecision(6));
  if (im === 0) return `${real} Ω`;
  return `${real} ${im < 0 ? '−' : '+'} j${Number(Math.abs(im).toPrecision(6))} Ω`;
}

function fail<T>(issues: readonly LineIssue[]): TextReadResult<T> {
  return { ok: false, issues };
}
