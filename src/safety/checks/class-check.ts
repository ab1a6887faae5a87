import { DERATING_SOURCE, IMPULSE_SOURCE, impulseTestVoltageV, isXClass, isYClass, SUBCLASS_USE_SOURCE, X_SUBCLASS_USE } from '../capacitor-classes.ts';
import { type CheckContext, describeSupply } from '../check-context.ts';
import { figure, formatFigure } from '../figure-format.ts';
import { isToGround, nameOf, type PlacedElement } from '../filter-positions.ts';
import { checkResult, judged, notApplicable, notChecked, type SafetyCheckResult, type SafetyFinding } from '../safety-finding.ts';

/**
 * Safety class of every capacitor on a mains input: from a line to protective earth a Y-class part,
 * across the line an X-class part or a Y-class one (tested to a higher impulse voltage than X2).
 * Each judged capacitor shows its subclass's IEC 60384-14 impulse test voltage at its capacitance.
 * The rated voltage is judged by the voltage check.
 */


export function classCheck(ctx: CheckContext): SafetyCheckResult {
  const assumptions = [
    'A Y-class part may also sit across the line; an X-class part never from a line to earth (a Y part is built to fail open).',
    'The X subclass depends on the overvoltage category of the installation: X2 for peak impulses up to 2.5 kV (category II), X1 above 2.5 kV up to 4 kV (category III) (secondary source).',
    'The rated voltage of each part is judged in the voltage check.',
  ];
  const supply = ctx.supply;
  const relevant = ctx.elements.enabled.filter((p) => p.element.part.kind === 'capacitor' || p.element.part.kind === 'damping-rc');
  if (supply === undefined) {
    return checkResult('class', [notChecked({ id: 'class.supply', title: 'Safety class', summary: 'Not checked: whether the input is mains is not given (operating.supply).' }, ['operating.supply'])], [], assumptions);
  }
  if (supply.kind === 'dc') {
    return checkResult('class',
      [notApplicable({ id: 'class.supply', title: 'Safety class', summary: `Not applicable: a ${describeSupply(supply)} input needs no X or Y class unless it is taken from mains or its standard asks for one.` })],
      [],
      assumptions,
    );
  }
  const findings = relevant.map(classFinding);
  return checkResult('class', findings, [], assumptions);
}

function classFinding(placed: PlacedElement): SafetyFinding {
  const { element } = placed;
  const id = `class.${element.id}`;
  const title = `Safety class of ${element.id}`;
  const where = element.placement === 'line-to-line' ? 'across the line' : isToGround(element.placement) ? 'from a line to protective earth' : 'in series with a line';
  const part = element.part;
  if (part.kind === 'damping-rc') {
    return judged(
      'warn',
      {
        id,
        subject: element.id,
        title,
        summary: `${nameOf(element)} is a damping R-C ${where}: its capacitor carries mains voltage, and the design holds no class for it. Use ${isToGround(element.placement) ? 'a Y-class' : 'an X-class (or Y-class)'} capacitor and check it by hand.`,
      },
      [figure('capacitance', part.capacitance, 'F')],
    );
  }
  if (part.kind !== 'capacitor') throw new Error('only capacitors and damping R-Cs reach the class check');
  const capacitance = figure('capacitance', part.capacitance, 'F');
  if (element.placement !== 'line-to-line' && !isToGround(element.placement)) {
    return judged('warn', { id, subject: element.id, title, summary: `${nameOf(element)} sits in series with a line: these checks cover capacitors across the lines or to ground only; check its rating by hand.` }, [capacitance]);
  }
  const cls = part.safetyClass;
  const toEarth = isToGround(element.placement);
  if (cls === 'none') {
    return judged(
      'fail',
      { id, subject: element.id, title, summary: `${nameOf(element)} ${where} has no safety class: on mains it must be ${toEarth ? 'a Y-class' : 'an X-class (or Y-class)'} part; never an ordinary capacitor of similar voltage.` },
      [capacitance],
    );
  }
  const impulse = impulseTestVoltageV(cls, part.capacitance);
  const figures = [capacitance, figure(`impulse test voltage of ${cls}${impulse.derated ? ' (derated above 1 µF)' : ''}`, impulse.voltageV, 'V')] as const;
  const sources = [IMPULSE_SOURCE, ...(impulse.derated ? [DERATING_SOURCE] : []), ...(isXClass(cls) ? [SUBCLASS_USE_SOURCE] : [])];
  const impulseWords = `${cls} parts are tested with ${formatFigure(impulse.voltageV, 'V')} peak impulses${impulse.derated ? ` at ${formatFigure(part.capacitance, 'F')} (derated above 1 µF; the derating rule is from a secondary source: check it against the standard)` : ''}`;
  if (toEarth && !isYClass(cls)) {
    return judged('fail', { id, subject: element.id, title, summary: `${nameOf(element)} is an ${cls} part from a line to protective earth: that position needs a Y-class part.`, sources }, figures);
  }
  return judged(
    'pass',
    {
      id,
      subject: element.id,
      title,
      summary: `${nameOf(element)} is ${cls} ${where}${isXClass(cls) ? ` (${cls} is for ${X_SUBCLASS_USE[cls]})` : toEarth ? '' : ', a Y-class part in place of an X-class one'}; ${impulseWords}.`,
      sources,
    },
    figures,
  );
}
