import { describe, expect, it } from 'vitest';
import { resolveOnsetOptions, sWindow } from '../../../core/pick/onset';
import { LOCAL_EARTHQUAKE, NEAR_FIELD_MICROSEISMIC } from '../../../core/pick/presets';
import { resolveStaLtaOptions } from '../../../core/pick/staLta';

describe('picking presets', () => {
  it('local earthquakes: STA 0.5 s, LTA 60 s, on 4, off 2 (Trnkoczy, NMSOP-2 IS 8.1, from memory), Vp/Vs 1.5-2.0', () => {
    expect(resolveStaLtaOptions(100, LOCAL_EARTHQUAKE.staLta)).toMatchObject({ sta: 0.5, lta: 60, triggerOn: 4, triggerOff: 2, form: 'recursive' });
    expect(resolveOnsetOptions(LOCAL_EARTHQUAKE.onset)).toEqual(LOCAL_EARTHQUAKE.onset);
    expect(sWindow(0, { ...LOCAL_EARTHQUAKE.sWindow, originTime: -2_000_000 })).toEqual({ from: 1_000_000, to: 2_000_000 });
  });

  it('near-field microseismic settings are valid at 500 Hz and keep the first 1.5 s quiet', () => {
    expect(resolveStaLtaOptions(500, NEAR_FIELD_MICROSEISMIC.staLta)).toMatchObject({ sta: 0.05, lta: 1, warmUp: 1.5 });
    expect(resolveOnsetOptions(NEAR_FIELD_MICROSEISMIC.onset).after).toBe(0.05);
    expect(sWindow(0, { ...NEAR_FIELD_MICROSEISMIC.sWindow, originTime: -100_000 })).toEqual({ from: 50_000, to: 300_000 });
  });
});
