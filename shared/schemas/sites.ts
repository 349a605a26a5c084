import { z } from 'zod';
import { printableName } from './text';

export const siteInputSchema = z
  .object({
    name: printableName(z.string().trim().min(1, 'Enter a site name').max(160)),
    address: z.string().trim().max(400).default(''),
    description: z.string().trim().max(2000).default(''),
  })
  .meta({ id: 'SiteInput' });
export type SiteInput = z.input<typeof siteInputSchema>;

export const siteSchema = z
  .object({
    id: z.string(),
    name: z.string(),
    address: z.string(),
    description: z.string(),
    createdAt: z.string(),
    updatedAt: z.string(),
  })
  .meta({ id: 'Site' });
export type Site = z.infer<typeof siteSchema>;

export const siteListSchema = z.object({ sites: z.array(siteSchema) });
