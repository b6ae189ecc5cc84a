import { describe, expect, it } from 'vitest';
import * as pkg from './index';

describe('package entry point', () => {
  it('exports every part the brief and the station rely on', () => {
    const functions = [
      // physics
      'idealDuty', 'inductorRippleApp', 'dimensionlessK', 'kCrit', 'criticalLoadOhm', 'criticalLoadCurrentA',
      'criticalInductanceH', 'dcmConversionRatio', 'dcmDutyForRatio', 'lcCornerHz', 'capacitiveRippleVpp',
      'esrRippleVpp', 'outputRippleVpp', 'dcmCapacitiveRippleVpp', 'switchingLossW', 'lossyCcmDuty', 'lossBreakdown',
      'solveOperatingPoint', 'rippleWaveform', 'secondOrderStepResponse', 'secondOrderOvershoot', 'secondOrderPeakTimeS',
      'normalisedDeviationPulse', 'capacitiveStepDeviationV', 'loadStepVoltageV', 'dampedFrequencies',
      'captureOutputRecord', 'stepIndexFor', 'protectionTest', 'varyUnit', 'clampDamping', 'hashString', 'mulberry32',
      // products, defects, unit model
      'genericProduct', 'findProduct', 'isProductModel', 'defectFor', 'applyDefect', 'validateSimulatorConfig', 'modelUnit',
      // protocol, transports, standalone
      'FixtureSimulator', 'LineSession', 'ErrorQueue', 'ScpiError', 'parseLine', 'parseNumber', 'parseBoolean', 'nodeMatches',
      'formatNr3', 'formatErrorReply', 'attachSimulator', 'detachSimulator', 'simulatorAt', 'RandomStream',
      'parseFixtureArgs', 'runFixture', 'fixtureCliMain', 'SimulatorConfigError', 'CliUsageError',
    ];
    for (const name of functions) expect(typeof (pkg as Record<string, unknown>)[name], name).toBe('function');
    const values = [
      'PRODUCTS', 'DEFECTS', 'DEMO_DEFECT_RATES', 'DEFAULT_SIMULATOR_CONFIG', 'NO_DEFECTS_CONFIG', 'SimulatedFixtureBinding',
      'REALISTIC_TIMING', 'FIXTURE_LIMITS', 'CAPTURE_DEFAULTS', 'SIMULATOR_FIRMWARE', 'HOT_THRESHOLD_C', 'STEP_POSITION',
      'SCPI_ERROR_TEXT', 'SCPI_NAN', 'CLI_USAGE', 'AMBIENT_C', 'MAX_PENDING_CHARS',
    ];
    for (const name of values) expect((pkg as Record<string, unknown>)[name], name).toBeDefined();
    expect(Object.keys(pkg.PRODUCTS).sort()).toEqual(['OB-BK0503', 'OB-BK1202', 'OB-BK3305']);
  });
});
