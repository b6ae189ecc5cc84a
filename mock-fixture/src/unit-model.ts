import { applyDefect, type UnitCondition } from './defects';
import type { ProductModel, UnitModel } from './physics/model-types';
import { varyUnit, type UnitIdentity } from './physics/unit-variation';

/** A unit as the simulator holds it: its model and its condition. */
export interface SimulatedUnit {
  identity: UnitIdentity;
  product: ProductModel;
  condition: UnitCondition;
  model: UnitModel;
}

/** Model one unit: the product design varied by serial and lot, then the unit's defect built in. */
export function modelUnit(identity: UnitIdentity, product: ProductModel, condition: UnitCondition): SimulatedUnit {
  return { identity, product, condition, model: applyDefect(varyUnit(product, identity), condition) };
}
