import { defineRoute } from '../../routing/route';
import { ChangeRoleBody, MemberDto, MemberList, MemberParams } from './members.schemas';
import * as members from './members.service';

export const membersRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/members',
    permission: 'members:read',
    summary: 'Members of the active organisation',
    response: MemberList,
    handler: ({ ctx }) => members.list(ctx),
  }),
  defineRoute({
    method: 'put',
    path: '/api/members/:userId/role',
    permission: 'members:manage',
    summary: "Change a member's role",
    params: MemberParams,
    body: ChangeRoleBody,
    response: MemberDto,
    handler: ({ ctx, params, body }) => members.changeRole(ctx, params.userId, body.role),
  }),
  defineRoute({
    method: 'delete',
    path: '/api/members/:userId',
    permission: 'members:manage',
    summary: 'Remove a member from the organisation',
    params: MemberParams,
    response: 'none',
    handler: ({ ctx, params }) => members.remove(ctx, params.userId),
  }),
];
