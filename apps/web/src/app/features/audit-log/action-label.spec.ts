import { actionLabel, entityLabel } from './action-label';

describe('actionLabel', () => {
  it('words a record and its verb', () => {
    expect(actionLabel('emission_unit.updated')).toBe('Emission unit changed');
    expect(actionLabel('channel.created')).toBe('Channel created');
    expect(actionLabel('stack.archived')).toBe('Stack archived');
  });

  it('uses the whole-action wording where the parts read poorly', () => {
    expect(actionLabel('session.signed_in')).toBe('Signed in');
    expect(actionLabel('import.rolled_back')).toBe('Import rolled back');
  });

  it('still says something readable for an action it does not know', () => {
    expect(actionLabel('report.signed_off')).toBe('Report signed off');
    expect(actionLabel('forged')).toBe('Forged');
  });
});

describe('entityLabel', () => {
  it('words known records and humanises the rest', () => {
    expect(entityLabel('emission_unit')).toBe('Emission unit');
    expect(entityLabel('import')).toBe('Import');
  });
});
