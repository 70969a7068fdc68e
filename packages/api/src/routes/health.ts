import { checkHealth } from '../services/health.ts';
import { route } from './table.ts';

export const healthRoutes = [
  route({
    method: 'get',
    path: '/health',
    access: 'public',
    summary: 'API and database status; 503 while the database is down',
    handler: async ({ services, res }) => {
      const health = await checkHealth(services.dataSource);
      res.status(health.database === 'up' ? 200 : 503).json(health);
    },
  }),
];
