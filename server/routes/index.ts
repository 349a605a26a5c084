import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { accountLinkRoutes } from './accountLinks';
import { attentionRoutes } from './attention';
import { authRoutes } from './auth';
import { calcRoutes, incidentEnergyRoute, shortCircuitRoute } from './calc';
import { compareRoutes } from './compare';
import { labelBatchRoutes, studyReportRoute } from './labelBatches';
import { labelFieldRoutes, labelRoutes } from './labels';
import { mailRoutes } from './mail';
import { mitigationRoutes } from './mitigation';
import { oneLineRoutes } from './oneLine';
import { organizationRoutes } from './organization';
import { deviceRoutes } from './devices';
import { siteRoutes } from './sites';
import { studyIoRoutes, studyRoutes } from './studies';
import { userRoutes } from './users';

export interface RouteOptions {
  signInLimitPerMinute: number;
  publicCheckPerMinute: number;
}

/** Every API route, in one table: the router, the OpenAPI document and the access tests read it. */
export function allRoutes(opts: RouteOptions): AnyRoute[] {
  return [
    bind(contract.system.health, {
      handler: async ({ ctx }) => {
        await ctx.db.sequelize.query('SELECT 1');
        return { ok: true, database: ctx.db.dialect };
      },
    }),
    ...authRoutes(opts),
    ...userRoutes,
    ...siteRoutes,
    ...organizationRoutes,
    incidentEnergyRoute,
    shortCircuitRoute,
    ...calcRoutes,
    ...deviceRoutes,
    ...studyRoutes,
    ...studyIoRoutes,
    ...oneLineRoutes,
    ...compareRoutes,
    ...mitigationRoutes,
    ...labelRoutes({ publicCheckPerMinute: opts.publicCheckPerMinute }),
    ...labelFieldRoutes,
    ...labelBatchRoutes,
    studyReportRoute,
    ...attentionRoutes,
    ...mailRoutes,
    ...accountLinkRoutes(opts),
  ];
}
