import type { InviteInput, MemberDto, Role } from '@hodboard/shared';
import { http } from './http';

export function listPeople(): Promise<MemberDto[]> {
  return http.get<MemberDto[]>('/people');
}

export function invitePerson(input: InviteInput): Promise<MemberDto> {
  return http.post<MemberDto>('/people/invite', input);
}

export function changeRole(id: string, role: Role): Promise<MemberDto> {
  return http.patch<MemberDto>(`/people/${encodeURIComponent(id)}`, { role });
}

export function removePerson(id: string): Promise<void> {
  return http.delete(`/people/${encodeURIComponent(id)}`);
}
