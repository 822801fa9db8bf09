/**
 * The key tables of resources/docs/reference.md, made from the files' JSON Schemas
 * (file-schemas.ts): every key with its type, whether it is required, its
 * default, its limits and what it means. Keys whose schema carries no
 * description take theirs from NOTES below, so every key is explained.
 * The doc holds each table between `<!-- keys:NAME -->` and
 * `<!-- /keys -->`; `npm run schemas` rewrites them and a test keeps the
 * committed doc equal to the generated one.
 */
import { FILE_SCHEMA_NAMES, jsonSchemaOf, type FileSchemaName } from './file-schemas.ts';

type Json = Record<string, unknown>;

/** Meanings of profile and DUT keys (their zod schemas carry them as comments). */
const NOTES: Readonly<Record<string, string>> = {
  schema: 'Format and version of the file: "tunebench.profile/1".',
  description: 'Free text shown to the user.',
  role: 'Which role the profile serves.',
  lineTerminator: 'Ends every command and reply line.',
  checkErrorsAfterWrite: 'Read SYST:ERR? after every write and fail the write when the queue holds errors.',
  init: 'Commands sent once after connecting (no placeholders), e.g. "*CLS".',
  timeouts: 'Reply deadlines, s.',
  'timeouts.defaultS': 'Longest wait for a reply, s.',
  'timeouts.measureMarginS': 'A reading may take the gate plus this long before it counts as "no reply", s.',
  capabilities: 'What the supply can do; a capability set to true requires its command.',
  'capabilities.channels': 'Number of output channels the profile addresses.',
  'capabilities.measureVoltage': 'Can read back the measured output voltage.',
  'capabilities.measureCurrent': 'Can read back the measured output current.',
  'capabilities.overVoltageProtection': 'Has a programmable over-voltage protection level.',
  commands: 'One command string per operation, with {placeholders} ({{ and }} for literal braces).',
  'commands.identify': 'Identity query. Placeholders: none.',
  'commands.setVoltage': 'Placeholders: {channel} {volts}.',
  'commands.getVoltageSetpoint': 'Placeholders: {channel}.',
  'commands.setCurrentLimit': 'Placeholders: {channel} {amps}.',
  'commands.setOverVoltageProtection':
    'Placeholders: {channel} {volts}. Required when capabilities.overVoltageProtection is true.',
  'commands.setOutput': 'Placeholders: {channel} {state} (ON/OFF).',
  'commands.getOutput': 'Placeholders: {channel}.',
  'commands.measureVoltage': 'Placeholders: {channel}. Required when capabilities.measureVoltage is true.',
  'commands.measureCurrent': 'Placeholders: {channel}. Required when capabilities.measureCurrent is true.',
  'commands.setGate': 'Placeholders: {gateS}.',
  'commands.readFrequency': 'Placeholders: {gateS}. A query: must return one reading.',
  'commands.readTemperature': 'Placeholders: none.',
  defaultGateS: 'Gate assumed until a plan sets one, s.',
  minGateS: 'Shortest gate the counter takes, s; a plan below it is refused before a run starts.',
  maxGateS: 'Longest gate the counter takes, s; a plan above it is refused before a run starts.',
  noSignal: 'Which replies mean "no oscillation" rather than a fault.',
  'noSignal.notANumber': 'The SCPI not-a-number 9.91E37 means no oscillation.',
  'noSignal.zero': 'A reading of 0 Hz means no oscillation.',
  'noSignal.timeout': 'No reply within gate + measureMarginS means no oscillation.',
  'noSignal.belowHz': 'Readings at or below this many Hz also count as no oscillation.',
  unit: 'Unit the instrument replies in; readings are converted to °C.',
  'capabilities.rampRate': 'The chamber takes a programmable ramp rate.',
  'capabilities.runStop': 'The chamber can be switched on and off (conditioning run/stop).',
  endAction: 'At the end of a campaign: drive to the plan\'s safeC ("setpoint") or switch conditioning off ("stop").',
  setpointToleranceC: 'A setpoint read back within this many °C of what was written counts as taken.',
  'commands.setSetpoint': 'Placeholders: {celsius}.',
  'commands.getSetpoint': 'Placeholders: none.',
  'commands.readAirTemperature': 'Placeholders: none.',
  'commands.setRampRate': 'Placeholders: {ratePerMin}. Required when capabilities.rampRate is true.',
  'commands.setRunning': 'Placeholders: {state} (ON/OFF). Required when capabilities.runStop is true.',
  'commands.getRunning': 'Placeholders: none. Required when capabilities.runStop is true.',
  tuningTempcoPpmPerC:
    'Fractional change per °C of the tuning sensitivity, ppm/°C: Kvco and the stall edge move with temperature.',
  thermalTauS: 'Thermal time constant of the DUT (board and package) to the air around it, s.',
  kind: 'Which physical model.',
  mode: 'Which settling rule.',
  id: 'Name of the DUT, recorded with every run.',
  supply: "The DUT's own supply.",
  'supply.nominalV': "Nominal supply, V; the simulated supply's channel 2 starts here.",
  'supply.minV': 'Below this supply the oscillator does not start, V.',
  'supply.currentA': 'Current drawn at nominal supply, A (modelled as a resistor).',
  tuning: 'The tuning port.',
  'tuning.settleTauS': 'First-order time constant of the tuning node, s.',
  'tuning.inputResistanceOhm': 'Input resistance of the tuning port, Ω.',
  tempcoPpmPerC: 'Fractional frequency change per °C around referenceC, ppm/°C.',
  referenceC: 'Temperature at which tempco is zero-referenced, °C.',
  warmup: 'Warm-up drift after power-on.',
  'warmup.offsetPpm': 'Fractional offset at power-on, ppm, decaying exponentially to zero.',
  'warmup.tauS': 'Time constant of the warm-up decay, s.',
  pushingHzPerV: 'Frequency change per volt of DUT supply away from nominal, Hz/V.',
  noise: 'Frequency noise.',
  'noise.whiteFmAt1s': 'White frequency noise: fractional σ of a 1 s average (scales as 1/√gate).',
  'noise.randomWalkPpmPerSqrtHour': 'Random-walk frequency wander, ppm/√h.',
  timing: 'Timing capacitor and its charge and discharge paths.',
  'timing.chargeResistanceOhm': 'Charge resistance, Ω.',
  'timing.capacitanceF': 'Timing capacitance, F.',
  'timing.dischargeResistanceOhm': 'Discharge resistance, Ω.',
  'timing.dischargeTargetV': 'The discharge path pulls the capacitor toward this rail, V.',
  thresholds: 'Comparator thresholds.',
  'thresholds.lowerV': 'Lower threshold, V.',
  'thresholds.upperV': 'Upper threshold, V; above lowerV.',
  'thresholds.noiseV': 'RMS noise on the thresholds, V; becomes timing jitter through dv/dt.',
  chargeDrive: 'Vc = gain·Vtune + offsetV, limited to supply − headroomV.',
  'chargeDrive.gain': 'Gain from tuning voltage to charge target.',
  'chargeDrive.offsetV': 'Offset of the charge target, V.',
  'chargeDrive.headroomV': 'Compliance headroom below the supply, V.',
  tank: 'LC tank.',
  'tank.inductanceH': 'Tank inductance, H.',
  'tank.parasiticCapacitanceF': 'Fixed capacitance across the tank, F.',
  varactor: 'Varactor C(V) = Cj0/(1 + V/φ)^γ.',
  'varactor.cj0F': 'Zero-bias junction capacitance Cj0, F.',
  'varactor.builtInV': 'Built-in potential φ, V.',
  'varactor.gradingExponent': 'Grading exponent γ: 1/2 abrupt, 1/3 linearly graded, > 1/2 hyperabrupt.',
  'varactor.minReverseV': 'Below this reverse bias the diode conducts and the oscillation stops, V.',
};

const QUANTITY_TYPES: Readonly<Record<string, string>> = {
  voltage: 'voltage (V)',
  current: 'current (A)',
  frequency: 'frequency (Hz)',
  time: 'time (s)',
};

function typeOf(node: Json): string {
  if ('const' in node) return `\`${JSON.stringify(node.const)}\``;
  if (Array.isArray(node.enum)) return node.enum.map((v) => `\`${JSON.stringify(v)}\``).join(' \\| ');
  const quantity = QUANTITY_TYPES[String(node['x-quantity'])];
  if (quantity !== undefined) return quantity;
  if (Array.isArray(node.type) && node.type.includes('number') && node.type.includes('string')) return 'number or text';
  if (node.type === 'array' && Array.isArray(node.prefixItems))
    return `pair of ${typeOf((node.prefixItems[0] as Json | undefined) ?? {})}`;
  if (node.type === 'array') return `array of ${typeOf((node.items as Json | undefined) ?? {})}`;
  if (Array.isArray(node.oneOf) || Array.isArray(node.anyOf)) return 'one of the forms below';
  return typeof node.type === 'string' ? node.type : 'any';
}

function limitsOf(node: Json): string {
  const parts: string[] = [];
  if (typeof node.minimum === 'number') parts.push(`≥ ${node.minimum}`);
  if (typeof node.exclusiveMinimum === 'number') parts.push(`> ${node.exclusiveMinimum}`);
  if (typeof node.maximum === 'number') parts.push(`≤ ${node.maximum}`);
  if (typeof node.minItems === 'number') parts.push(`≥ ${node.minItems} items`);
  if (typeof node.maxItems === 'number') parts.push(`≤ ${node.maxItems} items`);
  if (typeof node.minLength === 'number' && node.minLength > 1) parts.push(`≥ ${node.minLength} chars`);
  return parts.join(', ');
}

function cell(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
}

function rows(node: Json, prefix: string, required: boolean, out: string[]): void {
  const key = prefix;
  const meaning =
    typeof node.description === 'string'
      ? node.description
      : (NOTES[key.replace(/^[^(]*\([^)]*\)\./, '')] ?? NOTES[key] ?? '');
  const dflt = 'default' in node ? `\`${JSON.stringify(node.default).replace(/\|/g, '\\|')}\`` : '';
  if (key !== '' && key !== '$schema')
    out.push(
      `| \`${key}\` | ${typeOf(node)} | ${required ? 'yes' : ''} | ${dflt} | ${limitsOf(node)} | ${cell(meaning)} |`,
    );
  const props = node.properties as Record<string, Json> | undefined;
  const needed = new Set((node.required as string[] | undefined) ?? []);
  if (props)
    for (const [name, child] of Object.entries(props))
      rows(child, key === '' ? name : `${key}.${name}`, needed.has(name), out);
  const forms = (node.oneOf ?? node.anyOf) as Json[] | undefined;
  if (forms && key !== '') {
    for (const form of forms) {
      const tag = Object.entries((form.properties as Record<string, Json> | undefined) ?? {}).find(
        ([, p]) => 'const' in p,
      );
      const label = tag ? `${key} (${tag[0]} ${JSON.stringify(tag[1].const)})` : key;
      const formProps = (form.properties as Record<string, Json> | undefined) ?? {};
      const formNeeded = new Set((form.required as string[] | undefined) ?? []);
      for (const [name, child] of Object.entries(formProps)) rows(child, `${label}.${name}`, formNeeded.has(name), out);
    }
  }
}

const HEADER = ['| key | type | required | default | limits | meaning |', '|---|---|---|---|---|---|'];

/** The markdown key table(s) of one file format; a union of roles or kinds gives one table per form. */
export function keyTables(name: FileSchemaName): string {
  const schema = jsonSchemaOf(name);
  const forms = (schema.oneOf ?? schema.anyOf) as Json[] | undefined;
  if (forms) {
    return forms
      .map((form) => {
        const tag = Object.entries((form.properties as Record<string, Json> | undefined) ?? {}).find(
          ([k, p]) => (k === 'role' || k === 'kind') && 'const' in p,
        );
        const out: string[] = [];
        rows(form, '', true, out);
        return [`**${tag ? `${tag[0]} ${JSON.stringify(tag[1].const)}` : 'form'}**`, '', ...HEADER, ...out].join('\n');
      })
      .join('\n\n');
  }
  const out: string[] = [];
  rows(schema, '', true, out);
  return [...HEADER, ...out].join('\n');
}

/** `doc` with every `<!-- keys:NAME -->…<!-- /keys -->` block regenerated. */
export function regenerateReference(doc: string): string {
  return doc.replace(/<!-- keys:([\w-]+) -->[\s\S]*?<!-- \/keys -->/g, (whole, name: string) => {
    if (!(FILE_SCHEMA_NAMES as string[]).includes(name)) return whole;
    return `<!-- keys:${name} -->\n${keyTables(name as FileSchemaName)}\n<!-- /keys -->`;
  });
}
