/**
 * The contract every one-dimensional prior meets, and the plain specifications configs
 * write. A prior is built once (validated at the edge) and trusted afterwards.
 */
export type PriorSpec =
  | { readonly kind: 'uniform'; readonly lower: number; readonly upper: number }
  | { readonly kind: 'logUniform'; readonly lower: number; readonly upper: number }
  | { readonly kind: 'normal'; readonly mean: number; readonly sigma: number }
  | {
      readonly kind: 'truncatedNormal';
      readonly mean: number;
      readonly sigma: number;
      readonly lower: number;
      readonly upper: number;
    }
  | { readonly kind: 'fixed'; readonly value: number }
  | { readonly kind: 'periodic'; readonly lower: number; readonly upper: number };

export type PriorKind = PriorSpec['kind'];

export interface Prior {
  /** Name of the parameter this prior belongs to. */
  readonly name: string;
  /** A frozen copy of the specification it was built from. */
  readonly spec: PriorSpec;
  /** True for a parameter held at one value (not sampled). */
  readonly isFixed: boolean;
  /** True when the parameter lives on a circle of period `upper - lower`. */
  readonly periodic: boolean;
  /** Lower end of the support (may be -Infinity). */
  readonly lower: number;
  /** Upper end of the support (may be +Infinity). */
  readonly upper: number;
  /** Inverse cumulative distribution: maps u in [0, 1] to the parameter (unit-cube transform). */
  fromUnit(u: number): number;
  /** Normalised log density; -Infinity outside the support. */
  logDensity(x: number): number;
}
