import { HttpErrorResponse } from '@angular/common/http';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FormControl, FormGroup, Validators } from '@angular/forms';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, provideRouter } from '@angular/router';
import { of, throwError } from 'rxjs';

import { Role } from '../core/api/auth-api';
import { Auth } from '../core/auth/auth';
import { meAs } from '../testing/me-fixtures';
import { namesOf } from './names-of';
import { RecordEditor } from './record-editor';
import { upsertById } from './upsert-by-id';

const authAs = (role: Role) => ({ provide: Auth, useValue: { me: signal(meAs(role)).asReadonly() } });

const stale = new HttpErrorResponse({
  status: 409,
  error: { error: { code: 'stale_version', message: 'Changed by someone else.' } },
});

describe('RecordEditor', () => {
  let editor: RecordEditor;
  let navigate: jest.SpyInstance;
  let snack: jest.SpyInstance;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), authAs('officer'), RecordEditor] });
    editor = TestBed.inject(RecordEditor);
    navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    snack = jest.spyOn(TestBed.inject(MatSnackBar), 'open').mockReturnValue(undefined as never);
  });

  const form = () => new FormGroup({ name: new FormControl('Main stack', { nonNullable: true, validators: Validators.required }) });

  it('is ready once the record arrives and failed when it cannot be fetched', async () => {
    editor.conflict.set(true);
    await editor.load(async () => undefined);
    expect(editor.status()).toBe('ready');
    expect(editor.conflict()).toBe(false);
    await editor.load(() => Promise.reject(new Error('404')));
    expect(editor.status()).toBe('failed');
  });

  it('does not write an invalid form and shows every problem', async () => {
    const f = form();
    f.controls.name.setValue('');
    const write = jest.fn();
    await editor.save(f, write);
    expect(write).not.toHaveBeenCalled();
    expect(f.controls.name.touched).toBe(true);
  });

  it('turns a stale version into the conflict notice and clears the saving flag', async () => {
    let savingWhileWriting = false;
    await editor.save(form(), async () => {
      savingWhileWriting = editor.saving();
      throw stale;
    });
    expect(savingWhileWriting).toBe(true);
    expect(editor.saving()).toBe(false);
    expect(editor.conflict()).toBe(true);
  });

  it('archives, says so and returns to the site; a stale version leaves the person on the page', async () => {
    const f = form();
    f.markAsDirty();
    await editor.archive(of({}), f, 'Stack archived.', 'site-1');
    expect(f.dirty).toBe(false);
    expect(snack).toHaveBeenCalledWith('Stack archived.', 'Close', { duration: 5000 });
    expect(navigate).toHaveBeenCalledWith(['/sites', 'site-1']);

    navigate.mockClear();
    await editor.archive(
      throwError(() => stale),
      form(),
      'Stack archived.',
      'site-1',
    );
    expect(navigate).not.toHaveBeenCalled();
    expect(editor.conflict()).toBe(true);
  });

  it('counts typing as unsaved only for people who may edit', () => {
    const f = form();
    expect(editor.hasUnsavedChanges(f)).toBe(false);
    f.markAsDirty();
    expect(editor.hasUnsavedChanges(f)).toBe(true);
  });
});

describe('RecordEditor for an auditor', () => {
  it('never holds unsaved changes', () => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), authAs('auditor'), RecordEditor] });
    const editor = TestBed.inject(RecordEditor);
    const f = new FormGroup({ name: new FormControl('x') });
    f.markAsDirty();
    expect(editor.canEdit()).toBe(false);
    expect(editor.hasUnsavedChanges(f)).toBe(false);
  });
});

describe('upsertById', () => {
  it('replaces the item of the same id in place and adds a new one at the end, leaving the list as it was', () => {
    const items = [
      { id: 'a', v: 1 },
      { id: 'b', v: 2 },
    ];
    expect(upsertById(items, { id: 'a', v: 3 })).toEqual([
      { id: 'a', v: 3 },
      { id: 'b', v: 2 },
    ]);
    expect(upsertById(items, { id: 'c', v: 4 }).map((i) => i.id)).toEqual(['a', 'b', 'c']);
    expect(items[0].v).toBe(1);
  });
});

describe('namesOf', () => {
  it('names records in the order of the ids and leaves out unknown ones', () => {
    const units = [
      { id: 'u1', name: 'Boiler 1' },
      { id: 'u2', name: 'Boiler 2' },
    ];
    expect(namesOf(['u2', 'gone', 'u1'], units)).toBe('Boiler 2, Boiler 1');
    expect(namesOf([], units)).toBe('');
  });
});
