export { CommissionPlan, PartnerCommissionPlan } from './entities';
export { commissionRoutes } from './routes';
export { planFor, plansForPartners, listPlans, getPlan, createPlan, updatePlan, archivePlan, assignPlan } from './service';
