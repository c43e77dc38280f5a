import { z } from 'zod';
import { idSchema, pageQuerySchema, requiredText } from './common.js';

export const crewColourSchema = z
  .string()
  .trim()
  .regex(/^#[0-9a-fA-F]{6}$/, { message: 'Use a colour like #3a6ea5' })
  .transform((value) => value.toLowerCase());

export const crewInputSchema = z.object({
  name: requiredText(80, 'Crew name'),
  colour: crewColourSchema,
  leadMemberId: idSchema.nullable().optional().transform((value) => value ?? null),
  memberIds: z.array(idSchema).max(50).default([]),
});
export type CrewInput = z.input<typeof crewInputSchema>;
export type CrewParsed = z.output<typeof crewInputSchema>;

export const crewListQuerySchema = pageQuerySchema(['name', 'createdAt']);
export type CrewListQuery = z.infer<typeof crewListQuerySchema>;

export interface CrewMemberDto {
  memberId: string;
  name: string;
  role: string;
}
export interface CrewDto {
  id: string;
  name: string;
  colour: string;
  leadMemberId: string | null;
  members: CrewMemberDto[];
  version: number;
  createdAt: string;
}
