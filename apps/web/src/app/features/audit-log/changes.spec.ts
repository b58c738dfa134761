import { describeChanges } from './changes';

describe('describeChanges', () => {
  it('lists only the fields whose value changed', () => {
    expect(describeChanges({ role: 'manager', name: 'Mira' }, { role: 'officer', name: 'Mira' })).toEqual([
      { field: 'role', before: 'manager', after: 'officer' },
    ]);
  });

  it('lists every field of a created record with no old value', () => {
    expect(describeChanges(null, { name: 'Stack 1', heightM: 42 })).toEqual([
      { field: 'heightM', before: null, after: '42' },
      { field: 'name', before: null, after: 'Stack 1' },
    ]);
  });

  it('lists every field of a deleted record with no new value', () => {
    expect(describeChanges({ email: 'x@northmoor.example' }, null)).toEqual([
      { field: 'email', before: 'x@northmoor.example', after: null },
    ]);
  });

  it('shows a field that appeared or disappeared as a dash on the missing side', () => {
    expect(describeChanges({ a: 1 }, { b: { nested: true } })).toEqual([
      { field: 'a', before: '1', after: '—' },
      { field: 'b', before: '—', after: '{"nested":true}' },
    ]);
  });

  it('shows a snapshot that is not an object as one value field', () => {
    expect(describeChanges(null, ['a', 'b'])).toEqual([{ field: 'value', before: null, after: '["a","b"]' }]);
  });

  it('does not modify its inputs', () => {
    const before = Object.freeze({ role: 'auditor' });
    const after = Object.freeze({ role: 'admin' });
    describeChanges(before, after);
    expect(before).toEqual({ role: 'auditor' });
    expect(after).toEqual({ role: 'admin' });
  });
});
