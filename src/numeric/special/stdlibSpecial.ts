import { createRequire } from 'node:module';
import type erfType from '@stdlib/math/base/special/erf';
import type erfcType from '@stdlib/math/base/special/erfc';
import type erfcinvType from '@stdlib/math/base/special/erfcinv';
import type erfcxType from '@stdlib/math/base/special/erfcx';
import type gammaincType from '@stdlib/math/base/special/gammainc';
import type gammaincinvType from '@stdlib/math/base/special/gammaincinv';
import type gammalnType from '@stdlib/math/base/special/gammaln';

// The special functions arcsift takes from @stdlib/math, in one place. @stdlib packages are
// CommonJS folders without an exports map, which Node's ESM loader cannot import by folder name;
// require resolves them.
const require = createRequire(import.meta.url);

export const erf = require('@stdlib/math/base/special/erf') as typeof erfType;
export const erfc = require('@stdlib/math/base/special/erfc') as typeof erfcType;
export const erfcinv = require('@stdlib/math/base/special/erfcinv') as typeof erfcinvType;
export const erfcx = require('@stdlib/math/base/special/erfcx') as typeof erfcxType;
export const gammainc = require('@stdlib/math/base/special/gammainc') as typeof gammaincType;
export const gammaincinv = require('@stdlib/math/base/special/gammaincinv') as typeof gammaincinvType;
export const gammaln = require('@stdlib/math/base/special/gammaln') as typeof gammalnType;
