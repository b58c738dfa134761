/** Words for the records an audit entry names (`entity`), where the key alone reads poorly. */
const entityWords: Record<string, string> = {
  emission_unit: 'Emission unit',
  fuel_analysis: 'Fuel analysis',
  permit_limit: 'Limit',
  permit_document: 'Permit document',
  site_members: 'Site access',
  user: 'Person',
  membership: 'Membership',
};

/** Whole actions whose plain wording is not "<record> <verb>". */
const actionWords: Record<string, string> = {
  'session.signed_in': 'Signed in',
  'site.members_replaced': 'Site access changed',
  'fuel.analysis_added': 'Fuel analysis added',
  'permit.document_uploaded': 'Permit document uploaded',
  'member.role_changed': 'Member role changed',
  'import.uploaded': 'File uploaded for import',
  'import.mapped': 'Import columns mapped',
  'import.committed': 'Import committed',
  'import.rolled_back': 'Import rolled back',
  'readings.substituted': 'Readings substituted',
  'readings.invalidated': 'Readings marked invalid',
};

const verbWords: Record<string, string> = { updated: 'changed' };

function sentenceCase(text: string): string {
  const spaced = text.replace(/_/g, ' ').trim();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

/**
 * Plain words for a record key of the audit trail.
 *
 * @example
 * entityLabel('emission_unit') //=> 'Emission unit'
 */
export function entityLabel(entity: string): string {
  return entityWords[entity] ?? sentenceCase(entity);
}

/**
 * Plain words for an audit action key (`<record>.<verb>`); the key itself stays on screen beside
 * it, so an auditor can still search and cite the exact entry.
 *
 * @example
 * actionLabel('emission_unit.updated') //=> 'Emission unit changed'
 * actionLabel('session.signed_in')     //=> 'Signed in'
 */
export function actionLabel(action: string): string {
  const known = actionWords[action];
  if (known) return known;
  const dot = action.indexOf('.');
  if (dot < 0) return sentenceCase(action);
  const verb = action.slice(dot + 1);
  return `${entityLabel(action.slice(0, dot))} ${(verbWords[verb] ?? verb).replace(/_/g, ' ')}`;
}
