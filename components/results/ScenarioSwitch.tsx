import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { BusScenario } from '../../shared/schemas/studyResults';
import { fmt } from '../../hooks/units';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from '../ui';

/** A scenario's incident energy in a chip or a sentence: "12.3 cal/cm²", or why there is none. */
export function scenarioEnergyText(s: BusScenario): string {
  if (s.status === 'de-energized') return 'de-energized';
  if (s.status === 'error') return 'could not be evaluated';
  return s.incidentEnergyCalPerCm2 === undefined ? '—' : `${fmt(s.incidentEnergyCalPerCm2)} cal/cm²`;
}

/**
 * Which scenario the label takes at the bus and why, in one sentence; and, when another scenario is shown, that it is
 * not the label's basis.
 */
export function scenarioBasisSentence(scenarios: BusScenario[], governingId: string, shownId: string): string {
  const g = scenarios.find((s) => s.scenarioId === governingId);
  if (!g) return '';
  const evaluated = scenarios.filter((s) => s.status !== 'de-energized').length;
  const others = scenarios.filter((s) => s.scenarioId !== governingId && s.status === 'ok');
  let why: string;
  if (g.status === 'error') {
    why =
      `The scenario “${g.name}” could not be evaluated at this bus, so the label gives no value: the worst case of ` +
      `the ${scenarios.length} scenarios is unknown until it is fixed.`;
  } else {
    const against = others.length
      ? `, against ${others.map((s) => `${scenarioEnergyText(s)} in “${s.name}”`).join(', ')}`
      : '';
    why =
      `The label takes the scenario “${g.name}”: of the ${evaluated} scenario${evaluated === 1 ? '' : 's'} in which ` +
      `this bus is energized it gives the highest incident energy, ${scenarioEnergyText(g)}${against}.`;
  }
  if (shownId === governingId) return why;
  const shown = scenarios.find((s) => s.scenarioId === shownId);
  return `${why} The trace below is of “${shown?.name ?? shownId}” (${shown ? scenarioEnergyText(shown) : '—'}): not the label's basis.`;
}

/**
 * The operating scenarios of a bus as a row of chips (wrapping on a narrow screen): each with its incident energy, the
 * governing one marked "label basis", a failed one marked, a de-energized one disabled with its note below.
 */
export function ScenarioSwitch({
  scenarios,
  governingId,
  value,
  onChange,
  testID = 'scenario',
}: {
  scenarios: BusScenario[];
  governingId: string;
  value: string;
  onChange: (scenarioId: string) => void;
  testID?: string;
}) {
  const notes = scenarios.filter((s) => s.status !== 'ok' && s.note);
  return (
    <View style={styles.switch} testID={testID}>
      <T variant="label">Operating scenario</T>
      <View style={styles.options} accessibilityRole="radiogroup">
        {scenarios.map((s) => {
          const on = s.scenarioId === value;
          const dead = s.status === 'de-energized';
          const failed = s.status === 'error';
          const governs = s.scenarioId === governingId;
          const mark = governs ? 'label basis' : failed ? 'failed' : null;
          return (
            <Pressable
              key={s.scenarioId}
              accessibilityRole="radio"
              aria-checked={on}
              aria-disabled={dead}
              disabled={dead}
              accessibilityLabel={`${s.name}: ${scenarioEnergyText(s)}${mark ? `, ${mark}` : ''}`}
              onPress={() => onChange(s.scenarioId)}
              testID={`${testID}-${s.scenarioId}`}
              style={[styles.option, dead && styles.optionDead, failed && styles.optionFailed, on && styles.optionOn]}
            >
              <T style={[styles.name, on && styles.nameOn, dead && styles.nameDead]}>{s.name}</T>
              <View style={styles.line}>
                <T style={[styles.energy, s.status === 'ok' && styles.energyFigures, failed && styles.failed]}>
                  {scenarioEnergyText(s)}
                </T>
                {mark ? (
                  <T
                    testID={governs ? `${testID}-label-basis` : undefined}
                    style={[styles.mark, failed && styles.failed]}
                  >
                    {mark}
                  </T>
                ) : null}
              </View>
            </Pressable>
          );
        })}
      </View>
      {notes.map((s) => (
        <T key={s.scenarioId} variant="small" testID={`${testID}-note-${s.scenarioId}`}>
          {s.name}: {s.note}
        </T>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  switch: { gap: space.sm },
  options: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  option: {
    minHeight: touch.min,
    maxWidth: '100%',
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    justifyContent: 'center',
    borderRadius: radius.sm,
    borderWidth: 1.5,
    borderStyle: 'solid',
    borderColor: colors.line,
    backgroundColor: colors.surface,
    opacity: 1,
  },
  /** A de-energized scenario (cannot be chosen). */
  optionDead: { borderStyle: 'dashed', backgroundColor: colors.canvas, opacity: 0.75 },
  optionFailed: { borderColor: colors.danger },
  /** The chosen scenario (its colours win over the others). */
  optionOn: { borderWidth: 2, borderColor: colors.accent, backgroundColor: colors.accentSoft },
  name: { fontFamily: fonts.textMedium, color: colors.ink, fontSize: 15 },
  nameOn: { fontFamily: fonts.textBold },
  nameDead: { color: colors.muted },
  line: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', columnGap: space.sm },
  energy: { fontFamily: fonts.text, fontSize: 13, color: colors.muted },
  energyFigures: { fontFamily: fonts.numbers },
  mark: {
    fontFamily: fonts.textBold,
    fontSize: 12,
    textTransform: 'uppercase',
    letterSpacing: 0.4,
    color: colors.accent,
  },
  failed: { color: colors.danger },
});
