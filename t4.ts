import { certify, sampledCounts, states } from './src/lib/certify';
const data = sampledCounts(states.isotropic(4, 0.97), [0,1], 500, 3);
for (let rep = 0; rep < 3; rep++) {
let t = performance.now();
for (let i = 0; i < 200; i++) certify(data, { method: 'steering-2mub', resamples: 2000, seed: i + 1 });
console.log('per call', (performance.now() - t) / 200);
}
