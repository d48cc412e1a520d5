import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
// A namespace import lets the bundler drop the parts of zod that are not used.
import * as z from 'zod';
import {
  memberListSchema,
  memberSchema,
  type Invite,
  type Member,
} from '../../../shared/schemas/members';
import { callerShowsErrors } from '../errors/error-context';
import { parseWith } from '../errors/parse';

/** `{ member }`, as invite, update and resend answer. */
const memberResponseSchema = z.object({ member: memberSchema });

/** What an admin may change on a member. */
export interface MemberChange {
  role?: Member['role'];
  status?: 'active' | 'deactivated';
}

/** The school's members and invitations (`/api/members`, admins only). */
@Injectable({ providedIn: 'root' })
export class MembersApi {
  private readonly http = inject(HttpClient);

  list(): Observable<Member[]> {
    return this.http.get('/api/members').pipe(
      parseWith(memberListSchema),
      map((body) => body.members),
    );
  }

  /** The invite form shows this request's errors itself (e.g. 409 `email-taken`). */
  invite(invite: Invite): Observable<Member> {
    return this.http
      .post('/api/members/invitations', invite, { context: callerShowsErrors() })
      .pipe(
        parseWith(memberResponseSchema),
        map((body) => body.member),
      );
  }

  /** Errors (e.g. 400 `last-admin`) go to the snack-bar. */
  update(id: string, change: MemberChange): Observable<Member> {
    return this.http.patch(`/api/members/${encodeURIComponent(id)}`, change).pipe(
      parseWith(memberResponseSchema),
      map((body) => body.member),
    );
  }

  resendInvitation(id: string): Observable<Member> {
    return this.http.post(`/api/members/${encodeURIComponent(id)}/resend`, null).pipe(
      parseWith(memberResponseSchema),
      map((body) => body.member),
    );
  }
}
