export { consumeFifo } from './fifo';
export type { FifoLot, FifoLotByTotal, FifoLotByUnitCost, FifoAllocation, FifoResult } from './fifo';
export { energyCostCents, energyKwh, estimateHeatingKwh, OIL_SPECIFIC_HEAT_KJ_PER_KG_K } from './energy';
export type { EnergyInput, MeteredEnergy, HeaterEnergy } from './energy';
export { batchCost } from './batch-cost';
export type { BatchCost, BatchCostInput } from './batch-cost';
export {
  applyInflow,
  applyOutflow,
  averageCostCentsPerLiter,
  averageCostCentsPerGallon,
  recomputeMovingAverage,
  EMPTY_STOCK,
} from './moving-average';
export type { MovingAverageState, TankMovement, MovingAverageStep } from './moving-average';
