// A complete, valid demo guide for tests, seeds and the editor's empty state: drips after an
// electric valve closes. Limits and part numbers are invented demo values, not maker data.
import type { Caution, GuideContent, GuideMeta } from './schema';

const lockOut: Caution = {
  id: 'lock-out',
  hazard: 'electrical',
  text: 'The coil driver can put up to 170 V DC on the coil, and the valve fires if the line restarts.',
  action: 'Lock out and tag out the driver and the line controller, then check with a meter that the coil leads are dead.',
};

const relievePressure: Caution = {
  id: 'relieve-pressure',
  hazard: 'fluid-pressure',
  text: 'Fluid in the hose and the valve stays under pressure after the pump stops.',
  action: 'Close the supply valve and fire the valve into a waste cup (or open its drain) until the gauge reads zero.',
};

const hotValve: Caution = {
  id: 'hot-valve',
  hazard: 'heat',
  text: 'A heated valve, its nozzle and hot melt burn at 120 to 200 °C.',
  action: 'Let the valve cool below 50 °C, or wear heat-rated gloves and a face shield.',
};

const solvent: Caution = {
  id: 'solvent',
  hazard: 'chemical',
  text: 'Cleaning solvents are often flammable, and the fluid can irritate skin and eyes.',
  action: "Read the fluid's safety data sheet, keep ignition sources away and wear solvent-rated gloves and glasses.",
};

const injection: Caution = {
  id: 'injection',
  hazard: 'injection',
  text: 'Purging runs fluid at full pressure; a jet from a loose fitting can inject through skin. An injection is a medical emergency even when it looks small.',
  action: 'Check the fittings are tight, keep hands away from the nozzle and purge into a waste cup.',
};

const springEnergy: Caution = {
  id: 'spring',
  hazard: 'mechanical',
  text: 'The closing spring is preloaded and can throw the cap when it comes off.',
  action: 'Hold the cap down while you undo it and let the spring out slowly.',
};

const none = { cautions: [] as Caution[], photoIds: [] as string[], articleIds: [] as number[] };

export const SAMPLE_GUIDE_META: GuideMeta = {
  title: 'Drips after the valve closes (electric valve)',
  symptom: 'Drips or drool after the valve closes',
  summary: 'From the usual causes to the rarer ones: fluid pressure, air in the fluid, the seat and needle, the driver, the coil and the spring.',
  tags: ['electric', 'seat', 'needle', 'spring', 'coil', 'driver'],
};

export const SAMPLE_GUIDE: GuideContent = {
  startStepId: 'drip-when',
  steps: [
    {
      kind: 'ask',
      id: 'drip-when',
      title: 'When does fluid come out of the nozzle after the valve closes?',
      body: {
        doc: {
          type: 'doc',
          content: [
            {
              type: 'paragraph',
              content: [
                {
                  type: 'text',
                  text: 'Watch at least ten shots at normal line speed. A drop that forms within a second of the close points at the closing itself; a steady seep between shots points at the seat.',
                },
              ],
            },
          ],
        },
      },
      ...none,
      choices: [
        { id: 'after-each-shot', label: 'A drop forms right after every shot, then stops', next: 'fluid-pressure' },
        { id: 'between-shots', label: 'It seeps steadily between shots', next: 'clean-seat' },
        { id: 'after-stop', label: 'Mostly after the line stops, while the valve stays hot', next: 'nozzle-temp' },
      ],
    },
    {
      kind: 'measure',
      id: 'fluid-pressure',
      title: 'Read the fluid pressure at the valve inlet with the line running',
      body: {
        doc: {
          type: 'doc',
          content: [
            {
              type: 'paragraph',
              content: [
                {
                  type: 'text',
                  text: "This demo uses 5.5 bar as the line's limit. Set the limit from your own work instruction.",
                },
              ],
            },
          ],
        },
      },
      ...none,
      reading: { label: 'Fluid pressure at the valve inlet', kind: 'pressure', unit: 'bar' },
      bandUnit: 'bar',
      bands: [
        { id: 'normal', label: 'At or below the 5.5 bar limit', min: null, max: 5.5, minInclusive: false, maxInclusive: true, next: 'purge-air' },
        { id: 'high', label: 'Above the 5.5 bar limit', min: 5.5, max: null, minInclusive: false, maxInclusive: false, next: 'finding-pressure-high' },
      ],
    },
    {
      kind: 'try',
      id: 'purge-air',
      title: 'Purge trapped air from the valve',
      ...none,
      cautions: [injection, solvent],
      action: 'Purge the valve into a waste cup until the fluid runs without bubbles, spitting or crackling, then run 20 shots.',
      fixedNext: 'finding-air',
      notFixedNext: 'off-voltage',
    },
    {
      kind: 'measure',
      id: 'off-voltage',
      title: 'Measure the voltage on the coil leads with the shot signal off',
      ...none,
      cautions: [
        {
          id: 'live-leads',
          hazard: 'electrical',
          text: 'This reading is taken live: the driver may put up to 170 V DC on the coil leads.',
          action: 'Use a meter and probes rated for the driver voltage, hold both probes by their guards and do not touch the leads.',
        },
      ],
      reading: { label: 'Voltage on the coil with the signal off', kind: 'voltage', unit: 'V' },
      bandUnit: 'V',
      bands: [
        { id: 'released', label: '2 V or less: the driver releases the coil', min: null, max: 2, minInclusive: false, maxInclusive: true, next: 'coil-resistance' },
        { id: 'held', label: 'More than 2 V: the driver keeps the coil energised', min: 2, max: null, minInclusive: false, maxInclusive: false, next: 'finding-driver' },
      ],
    },
    {
      kind: 'measure',
      id: 'coil-resistance',
      title: 'Check the coil resistance against its nominal value',
      body: {
        doc: {
          type: 'doc',
          content: [
            {
              type: 'paragraph',
              content: [
                {
                  type: 'text',
                  text: 'The demo valve has a 28.8 Ω coil at 20 °C. Within ±10 % of nominal is common practice when the coil maker gives no tolerance. Shorted turns keep the field up after switch-off and slow the release.',
                },
              ],
            },
          ],
        },
      },
      ...none,
      cautions: [lockOut],
      reading: { label: 'Coil resistance, leads disconnected', kind: 'resistance', unit: 'ohm' },
      calculator: {
        id: 'coil-check',
        readingInput: 'measuredResistance',
        fixedInputs: {
          nominalResistance: { value: 28.8, unit: 'ohm' },
          supplyVoltage: { value: 24, unit: 'V' },
        },
        output: 'deviation',
      },
      bandUnit: '%',
      bands: [
        { id: 'low', label: 'More than 10 % below nominal', min: null, max: -10, minInclusive: false, maxInclusive: false, next: 'finding-coil-shorted' },
        { id: 'in-tolerance', label: 'Within 10 % of nominal', min: -10, max: 10, minInclusive: true, maxInclusive: true, next: 'spring-try' },
        { id: 'high', label: 'More than 10 % above nominal', min: 10, max: null, minInclusive: false, maxInclusive: false, next: 'handoff-engineer' },
      ],
    },
    {
      kind: 'try',
      id: 'spring-try',
      title: 'Fit a new closing spring',
      ...none,
      cautions: [lockOut, relievePressure, springEnergy],
      action: 'Take the cap off the valve, replace the closing spring with a new BP-SPR-08, refit the cap to its marked torque and run 50 shots.',
      fixedNext: 'finding-spring',
      notFixedNext: 'handoff-engineer',
    },
    {
      kind: 'try',
      id: 'clean-seat',
      title: 'Clean the seat and the needle tip',
      ...none,
      cautions: [lockOut, relievePressure, solvent],
      action: "Take out the needle, clean the seat and the needle tip with the solvent named on the fluid's data sheet and a soft brush, look at both under a 10× loupe, reassemble and run 20 shots.",
      fixedNext: 'finding-seat-debris',
      notFixedNext: 'seat-inspect',
    },
    {
      kind: 'ask',
      id: 'seat-inspect',
      title: 'What did you see on the seat and the needle tip under the loupe?',
      ...none,
      choices: [
        { id: 'seat-ring', label: 'A shiny ring or groove worn into the seat', next: 'finding-seat-worn' },
        { id: 'tip-chipped', label: 'A chip or a flat on the needle tip', next: 'finding-needle-chipped' },
        { id: 'both-fine', label: 'Both look clean and sharp', next: 'off-voltage' },
      ],
    },
    {
      kind: 'measure',
      id: 'nozzle-temp',
      title: 'Measure the nozzle temperature with a contact thermometer',
      ...none,
      cautions: [hotValve],
      reading: { label: 'Nozzle temperature', kind: 'temperature', unit: 'degC' },
      bandUnit: 'degC',
      bands: [
        { id: 'normal', label: "At or below the adhesive's 185 °C limit", min: null, max: 185, minInclusive: false, maxInclusive: true, next: 'short-nozzle' },
        { id: 'hot', label: 'Above 185 °C', min: 185, max: null, minInclusive: false, maxInclusive: false, next: 'finding-hot-melt' },
      ],
    },
    {
      kind: 'try',
      id: 'short-nozzle',
      title: 'Fit a shorter nozzle',
      ...none,
      cautions: [hotValve, relievePressure],
      action: 'Swap the nozzle for the shortest one that still reaches the part (BP-NZ-S04), so less hot material sits past the seat, and run 20 shots after a stop.',
      fixedNext: null,
      notFixedNext: 'clean-seat',
    },
    {
      kind: 'finding',
      id: 'finding-pressure-high',
      title: 'Fluid pressure too high',
      ...none,
      causeCode: 'fluid-pressure-high',
      cause: 'The fluid pressure is higher than the valve can close against cleanly: fluid is pushed past the seat while the needle closes.',
      remedy: [
        'Set the regulator back to the pressure on the work instruction.',
        'Watch the gauge over 20 shots; if the pressure creeps up, replace the regulator.',
        'Run 20 shots and check for drips.',
      ],
      parts: [],
      typicalMinutes: 15,
    },
    {
      kind: 'finding',
      id: 'finding-air',
      title: 'Air trapped in the fluid',
      ...none,
      causeCode: 'air-in-fluid',
      cause: 'Air trapped in the fluid is compressed while the valve is open and pushes fluid out after it closes.',
      remedy: [
        'Find where the air gets in: a loose fitting on the suction side, a tank run low, or a new drum not bled.',
        'Tighten or reseal the leaking fitting and bleed the supply line.',
        'Purge the valve again until the fluid runs clear.',
      ],
      parts: [{ name: 'Fitting seal kit', partNumber: 'BP-FSK-06', quantity: 1 }],
      typicalMinutes: 20,
    },
    {
      kind: 'finding',
      id: 'finding-driver',
      title: 'Driver not releasing the coil',
      ...none,
      causeCode: 'driver-fault',
      cause: 'The driver keeps voltage on the coil after the shot signal ends, so the needle closes late or not fully.',
      remedy: [
        "Check the driver's output and its signal wiring for a short or a stuck output.",
        'Replace the driver or its output card.',
        'Check with the meter that the coil voltage drops to 2 V or less when the signal is off.',
      ],
      parts: [{ name: 'Coil driver card', partNumber: 'BP-DRV-24', quantity: 1 }],
      typicalMinutes: 45,
    },
    {
      kind: 'finding',
      id: 'finding-coil-shorted',
      title: 'Coil with shorted turns',
      ...none,
      causeCode: 'coil-shorted',
      cause: 'Shorted turns in the coil keep the magnetic field up after switch-off, so the needle releases late.',
      remedy: ['Replace the coil with one of the same nominal resistance and voltage.', 'Measure the new coil before fitting it.', 'Run 50 shots and check for drips.'],
      parts: [{ name: 'Solenoid coil, 24 V DC, 28.8 Ω', partNumber: 'BP-COIL-24', quantity: 1 }],
      typicalMinutes: 30,
    },
    {
      kind: 'finding',
      id: 'finding-spring',
      title: 'Tired closing spring',
      ...none,
      causeCode: 'spring-fatigue',
      cause: 'The closing spring has lost force, so the needle closes too slowly and fluid escapes before it seats.',
      remedy: ['Leave the new spring in the valve.', "Record the valve's cycle count so the next spring change can be planned."],
      parts: [{ name: 'Closing spring', partNumber: 'BP-SPR-08', quantity: 1 }],
      typicalMinutes: 20,
    },
    {
      kind: 'finding',
      id: 'finding-seat-debris',
      title: 'Debris or cured fluid on the seat',
      ...none,
      causeCode: 'seat-debris',
      cause: 'Debris or cured fluid on the seat kept the needle from sealing.',
      remedy: [
        'Keep the cleaned seat and needle in service.',
        'Check the supply filter and change it if it is loaded.',
        'If the drip comes back within a week, look for where debris gets in: an open tank, a dirty drum change, cured fluid in the hose.',
      ],
      parts: [{ name: 'Filter element', partNumber: 'BP-FLT-100', quantity: 1 }],
      typicalMinutes: 30,
    },
    {
      kind: 'finding',
      id: 'finding-seat-worn',
      title: 'Worn seat',
      ...none,
      causeCode: 'seat-worn',
      cause: 'The seat is worn and no longer seals against the needle tip.',
      remedy: [
        'Replace the seat with a new BP-SEAT-15.',
        'Look at the needle tip under the loupe and replace it as well if it shows wear.',
        'Set the stroke again for the new seat, then run 50 shots and check for drips.',
      ],
      parts: [
        { name: 'Valve seat', partNumber: 'BP-SEAT-15', quantity: 1 },
        { name: 'Seat O-ring', partNumber: 'BP-OR-0915', quantity: 1 },
      ],
      typicalMinutes: 40,
    },
    {
      kind: 'finding',
      id: 'finding-needle-chipped',
      title: 'Chipped needle tip',
      ...none,
      causeCode: 'needle-chipped',
      cause: 'A chip in the needle tip leaves a path for fluid past the seat.',
      remedy: ['Replace the needle with a new BP-NDL-C15.', 'Look at the seat for marks from the chip and replace it too if it is marked.', 'Run 50 shots and check for drips.'],
      parts: [{ name: 'Needle, carbide tip', partNumber: 'BP-NDL-C15', quantity: 1 }],
      typicalMinutes: 40,
    },
    {
      kind: 'finding',
      id: 'finding-hot-melt',
      title: 'Hot melt expanding in an overheated nozzle',
      ...none,
      cautions: [hotValve],
      causeCode: 'temperature-wrong',
      cause: 'The nozzle runs hotter than the adhesive needs, so the hot melt expands past the closed seat and drools out.',
      remedy: [
        "Set the valve and nozzle temperature to the adhesive's data sheet value.",
        'Compare the controller reading with the contact thermometer; if they differ by more than 5 °C, replace the sensor.',
        'Let the temperature settle for 15 minutes, then stop the line and check for drool.',
      ],
      parts: [],
      typicalMinutes: 30,
    },
    {
      kind: 'handoff',
      id: 'handoff-engineer',
      title: 'Call the application engineer',
      ...none,
      contact: 'The senior technician or application engineer on call',
      message: "Tell them the valve still drips after close, which steps you took on this walk and the readings you got, and the valve's cycle count. Send them the walk summary.",
    },
  ],
};
