import { z } from 'zod';
import { roles } from '../terms/roles.js';

export const roleSchema = z.enum(roles);
