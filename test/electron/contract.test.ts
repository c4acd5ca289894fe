import { describe, expect, it } from 'vitest';
import { SCAN_PRESET_SETTINGS } from '../../electron/contract';
import { SCAN_PRESETS } from '../../core/scan/settings';

// electron/contract.ts imports nothing (the sandboxed preload bundles it), so the scan presets it
// offers in Settings are written out there; this keeps them the same as core's.
describe('the host contract', () => {
  it('offers in Settings exactly core\'s scan presets, and automatic first', () => {
    expect(SCAN_PRESET_SETTINGS).toEqual(['auto', ...SCAN_PRESETS]);
  });
});
