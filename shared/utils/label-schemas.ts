import { z } from 'zod'
import { ASSET_KINDS } from './asset-schemas'

export const labelSelectionSchema = z.object({
  siteId: z.uuid('Pick a site.'),
  kind: z.enum(ASSET_KINDS).optional(),
  ids: z.array(z.uuid()).max(2000).optional(),
  unprinted: z.boolean().default(false),
  layout: z.enum(['compact', 'standard', 'large']).default('standard'),
  paper: z.enum(['letter', 'a4']).default('letter'),
})
export type LabelSelection = z.infer<typeof labelSelectionSchema>
