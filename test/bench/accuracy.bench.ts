/**
 * Picking accuracy on synthetic nights (test/support/pickingAccuracy.ts): the project's chain
 * (core/pick) and the textbook floor on the same nights, scored against the generator's truth.
 *
 * Seeds fixed before any tuning of core/pick (2026-12-02): 101, 202, 303, 404. Each night is one hour
 * on the demo network with 24 local earthquakes of ML 0.5-2.5.
 * `node --import tsx test/bench/accuracy.bench.ts [SEED...]`
 */
import {
  accuracyNight, mergeScores, projectChain, renderNight, scoreChain, scoreTable, textbookChain, type Score,
} from '../support/pickingAccuracy';

export const ACCURACY_SEEDS = [101, 202, 303, 404];

const seeds = process.argv.slice(2).map(Number).filter((x) => Number.isFinite(x));
const use = seeds.length ? seeds : ACCURACY_SEEDS;
const project: Score[] = [];
const floor: Score[] = [];
for (const seed of use) {
  const t0 = performance.now();
  const night = renderNight(accuracyNight(seed, { minutes: 60, events: 24, magnitudes: [0.5, 2.5] }));
  const t1 = performance.now();
  project.push(scoreChain(night, projectChain(night)));
  const t2 = performance.now();
  floor.push(scoreChain(night, textbookChain(night)));
  console.log(`night ${seed}: rendered in ${((t1 - t0) / 1000).toFixed(1)} s, project chain ${((t2 - t1) / 1000).toFixed(1)} s`);
}
console.log(`\nnights: seeds ${use.join(', ')}; 60 min each, 24 events of ML 0.5-2.5, demo network\n`);
console.log(scoreTable([{ name: 'project', score: mergeScores(project) }, { name: 'textbook', score: mergeScores(floor) }]));
