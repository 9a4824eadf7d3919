import { certify } from './src/lib/certify';
import { countsForPower, POWER_SIMULATION } from './src/lib/certify/planner/power';
import { normalGuess, whiteNoiseTables } from './src/lib/certify/planner/design';
for (const [method, d, k, eta] of [['steering-2mub', 4, 4, 0.97], ['mub-correlation', 31, 29, 0.96]] as const) {
const design = { method, dimension: d, bases: [0, 1], confidence: 0.99865, model: whiteNoiseTables(d, 2, eta), weights: [1, 1], schmidtNumber: k };
const g = normalGuess(design, 0.9)!;
let calls = 0;
const eng = (a: any, b: any) => { calls++; return certify(a, b); };
const t = performance.now();
const r = countsForPower(eng, design, g, 1e10, POWER_SIMULATION);
console.log(method, g, r, calls, performance.now() - t);
}
