import { z } from 'zod';
import { ChannelDto } from '../channels/channels.schemas';
import { listQuery } from '../sites/list-query';
import { Id, Name, Version } from '../sites/shared-schemas';

const StackFields = z.object({
  name: Name,
  heightM: z.number().positive('Must be greater than 0').max(1000).nullish(),
  diameterM: z.number().positive('Must be greater than 0').max(100).nullish(),
  unitIds: z.array(Id).max(50),
});

export const CreateStackBody = StackFields.extend({ unitIds: StackFields.shape.unitIds.default([]) });
export type CreateStackBody = z.infer<typeof CreateStackBody>;
export const UpdateStackBody = StackFields.partial().extend({ version: Version });
export type UpdateStackBody = z.infer<typeof UpdateStackBody>;

export const StackListQuery = listQuery({ name: 'name', heightM: 'height_m', createdAt: 'created_at' }, 'name');

export const StackDto = z.object({
  id: Id,
  siteId: Id,
  name: z.string(),
  heightM: z.number().nullable(),
  diameterM: z.number().nullable(),
  unitIds: z.array(Id),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type StackDto = z.infer<typeof StackDto>;

export const StackWithChannelsDto = StackDto.extend({ channels: z.array(ChannelDto) });
export type StackWithChannelsDto = z.infer<typeof StackWithChannelsDto>;
