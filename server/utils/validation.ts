// The request kit's validation pieces. Field schemas live in shared/schemas/fields.ts (the forms use
// them too); this adds what only a handler reads (route params).
import { z } from 'zod'

export {
  CONTROL_CHARACTERS_MESSAGE,
  EmailSchema,
  InstantSchema,
  LatitudeSchema,
  LightRequirementSchema,
  LocalDateSchema,
  LongitudeSchema,
  PersonNameSchema,
  RoleSchema,
  TimeZoneSchema,
  TravelMinutesSchema,
  hasControlCharacters,
  numberBetween,
  singleLineText
} from '../../shared/schemas/fields'

export const IdParamsSchema = z.object({ id: z.coerce.number().int().positive() })
