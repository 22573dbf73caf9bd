// The checks fed by a real shot (src/solve/shot.ts): rails and armature derived from geometry, then the
// verdicts read from the shot's results.
import { describe, expect, it } from 'vitest';
import { runShot } from '../../src/solve/shot.js';
import { scenario, moduleGroup } from '../helpers/scenario.js';
import { deriveRails } from '../../src/conductors/rails.js';
import { deriveArmature } from '../../src/conductors/armature.js';
import { getMaterial } from '../../src/conductors/materials.js';
import { bankCharacteristicTime } from '../../src/conductors/resistance.js';
import { engineeringChecks } from '../../src/checks/engineering.js';

describe('engineering checks on a real shot', () => {
  const copper = getMaterial('copper');
  const alloy = getMaterial('aluminium-6061-t6');
  const railGeometry = { kind: 'rectangular' as const, height: 0.012, width: 0.01, separation: 0.012 };
  const bank = [moduleGroup({ count: 2, capacitance: 500e-6, voltage: 6000, inductance: 4e-6 })];
  const feedInductance = 0.25e-6;
  const tau = bankCharacteristicTime(bank, feedInductance);
  const rails = deriveRails(railGeometry, copper, tau);
  const armature = deriveArmature({ height: 0.012, width: 0.012, length: 0.01 }, alloy);
  const shot = runShot(
    scenario({
      bank,
      feed: { inductance: feedInductance, resistance: 1e-3 },
      rails: { length: 1, inductanceGradient: rails.inductanceGradientHighFrequency, resistanceGradient: rails.resistanceGradient! },
      armature: { mass: armature.mass, resistance: armature.resistance },
    }),
    { waveforms: false },
  );
  const checks = engineeringChecks({
    results: shot.results,
    bank,
    rails: { geometry: railGeometry, material: copper },
    armature: { currentArea: armature.currentArea, material: alloy },
    contact: { preload: 0, magneticLoading: 0 },
  });
  const byId = (id: string) => checks.find((c) => c.id === id)!;

  it('the derived rails are in the range of lab guns (0.4–0.6 µH/m, common practice) and R′ is above its DC value', () => {
    expect(rails.inductanceGradientHighFrequency).toBeGreaterThan(0.4e-6);
    expect(rails.inductanceGradientHighFrequency).toBeLessThan(0.6e-6);
    expect(rails.resistanceGradient!).toBeGreaterThanOrEqual(rails.resistanceGradientDC!);
  });

  it('reads the action integral, peak current and module reversal from the shot', () => {
    expect(byId('armature-action').value).toBeCloseTo(shot.results.actionIntegral / armature.currentArea ** 2, -6);
    expect(byId('linear-current-density').value).toBeCloseTo(shot.results.peakCurrent / 0.012, 0);
    expect(byId('capacitor-reversal[0]').value).toBe(shot.results.modules[0]!.reversal);
  });

  it('an 18 kJ bank at 6 kV is flagged for shock and arc flash (DOE-HDBK-1092), and zero contact force is flagged (1 gf/A, common practice)', () => {
    expect(byId('capacitor-shock-hazard').verdict).toBe('warn');
    expect(byId('capacitor-arc-flash-hazard').verdict).toBe('warn');
    expect(byId('contact-force').verdict).toBe('warn');
  });
});
