#!/usr/bin/env node
// Regenerates test-plans/plan.schema.json and the step-kind tables of docs/test-plan-format.md from the step-kind
// registry (station-api/src/plans/step-kinds). Run through `npm run gen:plan-schema -w station-api`, which builds first.
const { writePlanArtifacts } = require('../dist/plans/plan-artifacts');

for (const file of writePlanArtifacts()) console.log(`written ${file}`);
