import { Button, Group, NumberInput, Stack, Text } from '@mantine/core';
import { DEFAULT_SUGGESTION_K, SUGGESTION_K_MAX, SUGGESTION_K_MIN, suggestionKProblem, suggestionUncertaintyProblem } from '@contract/limit-suggestion';
import { formatFigure, formatLimits } from '@contract/value-format';
import type { DataSetColumn, LimitSuggestion } from '../api/types';
import { numberOrUndefined, ppmText } from './characterization-format';

/** What the engineer typed into the k and U fields. */
export interface SuggestionInput {
  kText: string | number;
  uText: string | number;
}

/** U as the engineer wrote it (0.01, not 0.0100): a stated uncertainty, not a measured value. */
export function uText(u: number): string {
  return String(Number(u.toPrecision(4)));
}

export const DEFAULT_SUGGESTION_INPUT: SuggestionInput = { kText: DEFAULT_SUGGESTION_K, uText: 0 };

/** The settings read from the fields: the values when both are accepted, else each field's problem. */
export type SuggestionSettingsRead =
  | { ok: true; k: number; uncertainty: number }
  | { ok: false; kError: string | null; uError: string | null };

/**
 * Reads the k and U fields with the API's own bounds (`@contract/limit-suggestion`), so the field shows the message
 * the server would give. An empty U means 0 (no guard band); an empty k is a problem (there is no "no k").
 */
export function readSuggestionSettings(input: SuggestionInput): SuggestionSettingsRead {
  const k = numberOrUndefined(input.kText);
  const uEmpty = typeof input.uText === 'string' && input.uText.trim() === '';
  const u = uEmpty ? 0 : numberOrUndefined(input.uText);
  const kError = suggestionKProblem(k);
  const uError = suggestionUncertaintyProblem(u);
  if (kError || uError) return { ok: false, kError, uError };
  return { ok: true, k: k!, uncertainty: u! };
}

/**
 * A U that leaves no room between the guarded limits: x̄ ± k·s guarded by U is empty once U ≥ k·s (ILAC-G8:09/2019
 * §4.2.2, acceptance limits TL + U and TL − U). The server answers without a suggestion then; the field says why.
 */
export function guardClosesProblem(k: number, uncertainty: number, sd: number | null | undefined, unit: string, digits: number): string | null {
  if (sd === null || sd === undefined || !(sd > 0) || !(uncertainty > 0)) return null;
  const halfWidth = k * sd;
  if (uncertainty < halfWidth) return null;
  return `U closes the guarded zone: keep it below k·s = ${formatFigure(halfWidth, digits + 1)} ${unit}, or widen k`;
}

interface SuggestionSettingsProps {
  column: DataSetColumn;
  input: SuggestionInput;
  onChange: (input: SuggestionInput) => void;
  /** the suggestion the server answered for the settings in force (null while it has none) */
  suggestion: LimitSuggestion | null | undefined;
  /** sample standard deviation of the quantity, to say when U closes the guarded zone */
  sd: number | null | undefined;
  digits: number;
  onUseSuggested: () => void;
}

/**
 * The two settings of the suggested limits, k and U, with the suggested and guarded limits they give. A change asks
 * the server again (the screen debounces it); a refused value stays on its field and is not sent.
 */
export function SuggestionSettings({ column, input, onChange, suggestion, sd, digits, onUseSuggested }: SuggestionSettingsProps) {
  const read = readSuggestionSettings(input);
  const closes = read.ok ? guardClosesProblem(read.k, read.uncertainty, sd, column.unit, digits) : null;
  const kError = read.ok ? null : read.kError;
  const uError = read.ok ? closes : read.uError;
  const guarded = suggestion && suggestion.uncertainty > 0;
  return (
    <Stack gap="xs" aria-label="Suggested limits" component="section">
      <Group align="flex-start" gap="md" wrap="wrap">
        <NumberInput
          label="Width k"
          description="limits at mean ± k·s"
          value={input.kText}
          onChange={(kText) => onChange({ ...input, kText })}
          min={SUGGESTION_K_MIN}
          max={SUGGESTION_K_MAX}
          step={0.5}
          decimalScale={3}
          clampBehavior="none"
          rightSection={
            <Text size="xs" c="dimmed" ff="monospace">
              × s
            </Text>
          }
          w={170}
          ff="monospace"
          error={kError}
        />
        <NumberInput
          label={`Guard U (${column.unit})`}
          description="coverage factor 2"
          placeholder="0"
          value={input.uText}
          onChange={(uText) => onChange({ ...input, uText })}
          min={0}
          step={0.001}
          decimalScale={6}
          clampBehavior="none"
          rightSection={
            <Text size="xs" c="dimmed" ff="monospace">
              {column.unit}
            </Text>
          }
          w={190}
          ff="monospace"
          error={uError}
        />
        {suggestion && (
          <Stack gap={2} pt={4}>
            <Text size="xs" c="dimmed">
              Suggested (mean ± {suggestion.k}·s)
            </Text>
            <Text ff="monospace" size="sm" data-testid="suggested-limits">
              {formatLimits(suggestion.tolerance.low, suggestion.tolerance.high, column.name, column.unit, digits)}
            </Text>
            <Text size="xs" c="dimmed" data-testid="suggested-ppm">
              expected outside: <Text span ff="monospace" fz="xs">{ppmText(suggestion.ppmOutsideTolerance.total)}</Text> ppm
            </Text>
          </Stack>
        )}
        {suggestion && (
          <Stack gap={2} pt={4}>
            <Text size="xs" c="dimmed">
              {guarded ? `Guarded by U = ${uText(suggestion.uncertainty)} ${column.unit}` : 'Guarded: no guard band (U = 0)'}
            </Text>
            <Text ff="monospace" size="sm" data-testid="guarded-limits">
              {formatLimits(suggestion.acceptance.low, suggestion.acceptance.high, column.name, column.unit, digits)}
            </Text>
            <Text size="xs" c="dimmed" data-testid="guarded-ppm">
              the station would reject: <Text span ff="monospace" fz="xs">{ppmText(suggestion.ppmOutsideAcceptance.total)}</Text> ppm
            </Text>
          </Stack>
        )}
        {suggestion && (
          <Button size="xs" variant="light" onClick={onUseSuggested} mt={22}>
            Use suggested limits
          </Button>
        )}
      </Group>
      <Text size="xs" c="dimmed">
        k is a plain number: wider k, wider limits ({DEFAULT_SUGGESTION_K} puts Ppk at 1.33 on them). U starts at 0 because a data set is not tied to a fixture: copy
        it from the certificate of the fixture that will test this limit. Put into the draft, U guards the limit; at test time a certificate that states a U
        for the quantity replaces it.
      </Text>
    </Stack>
  );
}
