// Regenerate scenarios/railpulse.schema.json from the loader's field table (npm run schema).
import { writeFileSync } from 'node:fs';
import { scenarioSchema } from '../src/scenario/schema.js';

writeFileSync('scenarios/railpulse.schema.json', JSON.stringify(scenarioSchema(), null, 2) + '\n');
console.log('wrote scenarios/railpulse.schema.json');
