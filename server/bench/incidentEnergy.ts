/**
 * Throughput of the IEEE 1584-2018 incident-energy calculation: computeIncidentEnergy over a varied set of inputs
 * (all five electrode configurations, the three voltage regimes, typical, shallow and open-air geometry) for about
 * 1.5 s. Reports evaluations per second; nothing here asserts a time.
 */
import { ELECTRODE_CONFIGS } from '../../shared/equipmentClasses';
import { computeIncidentEnergy, type IncidentEnergyInput } from '../engine/ieee1584';

const RUN_MS = 1500;

function benchInputs(): IncidentEnergyInput[] {
  const inputs: IncidentEnergyInput[] = [];
  const regimes = [
    { voltageV: 208, gapMm: 25, workingDistanceMm: 457.2, enclosureMm: { height: 355.6, width: 304.8, depth: 203.2 } },
    { voltageV: 480, gapMm: 32, workingDistanceMm: 609.6, enclosureMm: { height: 508, width: 508, depth: 508 } },
    {
      voltageV: 2400,
      gapMm: 104,
      workingDistanceMm: 914.4,
      enclosureMm: { height: 660.4, width: 660.4, depth: 660.4 },
    },
    { voltageV: 4160, gapMm: 104, workingDistanceMm: 914.4, enclosureMm: { height: 1143, width: 762, depth: 762 } },
    { voltageV: 13800, gapMm: 152, workingDistanceMm: 914.4, enclosureMm: { height: 1143, width: 762, depth: 762 } },
  ];
  const currentsKa = [1, 5, 15, 30, 50];
  for (const config of ELECTRODE_CONFIGS) {
    for (const regime of regimes) {
      for (const boltedFaultKa of currentsKa) {
        inputs.push({
          ...regime,
          electrodeConfig: config,
          boltedFaultKa,
          clearingMs: { full: 50 + boltedFaultKa, reduced: 80 + 2 * boltedFaultKa },
        });
      }
    }
  }
  return inputs;
}

export async function benchIncidentEnergy(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const inputs = benchInputs();
  let evaluations = 0;
  let checksum = 0;
  const start = performance.now();
  let elapsedMs = 0;
  while (elapsedMs < RUN_MS) {
    for (const input of inputs) {
      checksum += computeIncidentEnergy(input).incidentEnergyJPerCm2;
    }
    evaluations += inputs.length;
    elapsedMs = performance.now() - start;
    // Yield between rounds so a caller running several benches stays responsive.
    await new Promise((resolve) => setImmediate(resolve));
  }
  const opsPerSecond = (evaluations / elapsedMs) * 1000;
  return {
    name: 'IEEE 1584-2018 incident energy (computeIncidentEnergy)',
    opsPerSecond,
    detail:
      `${evaluations} evaluations of ${inputs.length} inputs (5 configurations × 5 voltages 208 V-13.8 kV × 5 currents) ` +
      `in ${elapsedMs.toFixed(0)} ms; checksum ${checksum.toExponential(6)}`,
  };
}
