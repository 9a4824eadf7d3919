import { planExperiment } from './src/lib/certify/planner/plan-experiment';
let t = performance.now();
const p = planExperiment({ method: 'mub-correlation', dimension: 31, schmidtNumber: 29, visibility: 0.96 });
console.log(JSON.stringify({ ...p, rungs: p.rungs.slice(-3), curve: p.curve.slice(0, 5) }, null, 1));
console.log('ms', performance.now() - t);
t = performance.now();
const q = planExperiment({ method: 'steering-2mub', dimension: 4, schmidtNumber: 4, visibility: 0.97 , simulate: 'all'});
console.log(JSON.stringify(q, null, 1).slice(0, 3000));
console.log('ms', performance.now() - t);
