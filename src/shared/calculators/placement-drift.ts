// Where material lands relative to where it was commanded, from line speed and valve response times.
import { num, optNum } from './helpers';
import type { Calculator, InputDeclaration } from './types';

/** Error left by a distance-based compensation calibrated at vCal and run at v: (v − vCal) t. */
export function distanceCompensationError(lineSpeed: number, calibrationSpeed: number, responseTime: number): number {
  return (lineSpeed - calibrationSpeed) * responseTime;
}

const delay = (name: string, label: string, optional: boolean, help: string): InputDeclaration => ({
  name,
  label,
  kind: 'time',
  optional,
  defaultUnit: 'ms',
  min: 0,
  help,
});

export const placementDrift: Calculator = {
  id: 'placement-drift',
  title: 'Placement drift',
  summary: 'Shows how far a bead starts and ends from where it was commanded at line speed, and how a slower valve moves the edges.',
  inputs: [
    {
      name: 'lineSpeed',
      label: 'Line speed',
      kind: 'speed',
      optional: false,
      defaultUnit: 'mm/s',
      min: 0,
      help: 'Speed of the part under the nozzle.',
    },
    delay('openDelay', 'Opening delay', false, 'Time from the open command to flow reaching the chosen threshold (e.g. 50 % of full flow).'),
    delay('closeDelay', 'Closing delay', false, 'Time from the close command to flow falling below the same threshold.'),
    {
      name: 'commandedLength',
      label: 'Commanded bead length',
      kind: 'length',
      optional: true,
      defaultUnit: 'mm',
      min: 0,
      help: 'Length the bead is programmed to be.',
    },
    delay('newOpenDelay', 'New opening delay', true, 'Opening delay after a change, e.g. a colder fluid or a different driver.'),
    delay('newCloseDelay', 'New closing delay', true, 'Closing delay after a change, e.g. a tired spring or higher viscosity.'),
  ],
  outputs: [
    { name: 'startOffset', label: 'Start offset', kind: 'length', unit: 'mm' },
    { name: 'tailLength', label: 'Tail after close', kind: 'length', unit: 'mm' },
    { name: 'placedLength', label: 'Placed bead length', kind: 'length', unit: 'mm', optional: true },
    { name: 'advanceDistance', label: 'Advance the open command by', kind: 'length', unit: 'mm' },
    { name: 'startShift', label: 'Start shift after the change', kind: 'length', unit: 'mm', optional: true },
    { name: 'tailShift', label: 'Tail shift after the change', kind: 'length', unit: 'mm', optional: true },
  ],
  formula: [
    'Start offset = v × t_open;  tail = v × t_close',
    'Placed length = commanded length + v (t_close − t_open)',
    'Compensation: advance the open command by t_open (a distance of v × t_open) and the close command by t_close',
    'A change Δt in a response time moves that edge by v × Δt',
    'Distance compensation set at speed v_cal and run at v leaves an error of (v − v_cal) × t',
  ].join('\n'),
  limits: [
    'Measure both delays to the same flow threshold (e.g. 50 % of flow), not to the electrical edge.',
    'Response time drifts with viscosity, temperature, spring fatigue, coil temperature and air-tube length.',
    'Time-based compensation holds at any line speed; distance-based compensation does not.',
    'Constant line speed assumed.',
  ],
  references: [{ text: 'Constant-speed kinematics', tag: 'derived' }],
  compute(inputs) {
    const speed = num(inputs, 'lineSpeed');
    const open = num(inputs, 'openDelay');
    const close = num(inputs, 'closeDelay');
    const commanded = optNum(inputs, 'commandedLength');
    const newOpen = optNum(inputs, 'newOpenDelay');
    const newClose = optNum(inputs, 'newCloseDelay');
    return {
      outputs: {
        startOffset: speed * open,
        tailLength: speed * close,
        placedLength: commanded === undefined ? undefined : commanded + speed * (close - open),
        advanceDistance: speed * open,
        startShift: newOpen === undefined ? undefined : speed * (newOpen - open),
        tailShift: newClose === undefined ? undefined : speed * (newClose - close),
      },
      warnings: [],
    };
  },
};
