import { createRequire } from 'node:module';
import type erfcType from '@stdlib/math/base/special/erfc';
import type erfcinvType from '@stdlib/math/base/special/erfcinv';
import type erfcxType from '@stdlib/math/base/special/erfcx';

// @stdlib packages are CommonJS folders without an exports map, which Node's ESM loader cannot
// import by folder name; require resolves them.
const require = createRequire(import.meta.url);

export const erfc = require('@stdlib/math/base/special/erfc') as typeof erfcType;
export const erfcinv = require('@stdlib/math/base/special/erfcinv') as typeof erfcinvType;
export const erfcx = require('@stdlib/math/base/special/erfcx') as typeof erfcxType;
