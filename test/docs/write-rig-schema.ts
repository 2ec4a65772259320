// `npm run rig:schema`: rewrites protocol/rig.schema.json from the zod rig schema (temp file + rename).
import { renameSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { rigSchemaFileText } from '../../protocol/rig-schema.ts';

const file = fileURLToPath(new URL('../../protocol/rig.schema.json', import.meta.url));
const tmp = `${file}.${process.pid}.tmp`;
writeFileSync(tmp, rigSchemaFileText());
renameSync(tmp, file);
process.stdout.write('protocol/rig.schema.json regenerated\n');
