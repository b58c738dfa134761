import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';

import { CommitResult } from '../../../core/api/imports-api';
import { PROGRESS_POLL_INTERVAL_MS } from '../progress-polling';
import { CommitPanel } from './commit-panel';

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

function text(fixture: ComponentFixture<unknown>): string {
  return (fixture.nativeElement as HTMLElement).textContent ?? '';
}

describe('CommitPanel', () => {
  let fixture: ComponentFixture<CommitPanel>;
  let loader: HarnessLoader;
  let http: HttpTestingController;
  let results: CommitResult[];

  function create(pollIntervalMs: number): void {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: PROGRESS_POLL_INTERVAL_MS, useValue: pollIntervalMs }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CommitPanel);
    fixture.componentRef.setInput('importId', 'imp-1');
    results = [];
    fixture.componentInstance.committed.subscribe((result) => results.push(result));
    loader = TestbedHarnessEnvironment.loader(fixture);
  }

  afterEach(() => http.verify());

  const commitButton = () => loader.getHarness(MatButtonHarness.with({ text: /Commit import/ }));

  describe('when stored values conflict with the file', () => {
    beforeEach(async () => {
      create(3_600_000);
      await settle(fixture);
    });

    it('asks for the replace choice and a reason, and only then sends both', async () => {
      await (await commitButton()).click();
      const first = http.expectOne({ method: 'POST', url: '/api/imports/imp-1/commit' });
      expect(first.request.body).toEqual({});
      first.flush(
        { error: { code: 'conflicts', message: '12 stored values differ from the file.', details: { conflicts: 12 } } },
        { status: 409, statusText: 'Conflict' },
      );
      await settle(fixture);

      expect(text(fixture)).toContain('12 stored values differ from this file');
      expect(results).toHaveLength(0);
      // Without the explicit choice the commit cannot be repeated.
      expect(await (await commitButton()).isDisabled()).toBe(true);

      const replace = await loader.getHarness(MatCheckboxHarness.with({ label: 'Replace conflicting values' }));
      await replace.check();
      expect(await (await commitButton()).isDisabled()).toBe(false);

      // A reason is required: an empty one sends nothing.
      await (await commitButton()).click();
      http.expectNone('/api/imports/imp-1/commit');
      expect(text(fixture)).toContain('Say why the stored values are replaced');

      await (await loader.getHarness(MatInputHarness.with({ selector: 'textarea' }))).setValue('Analyser re-linearised after the audit');
      await (await commitButton()).click();
      const second = http.expectOne({ method: 'POST', url: '/api/imports/imp-1/commit' });
      expect(second.request.body).toEqual({ replaceConflicts: true, reason: 'Analyser re-linearised after the audit' });
      second.flush({ inserted: 0, unchanged: 43_188, superseded: 12, conflicts: 12, nothingNew: false });
      await settle(fixture);

      expect(results).toEqual([{ inserted: 0, unchanged: 43_188, superseded: 12, conflicts: 12, nothingNew: false }]);
    });

    it('shows other refusals as they come, without asking to replace', async () => {
      await (await commitButton()).click();
      http
        .expectOne('/api/imports/imp-1/commit')
        .flush({ error: { code: 'not_mapped', message: 'Map the columns before committing.' } }, { status: 422, statusText: 'Unprocessable' });
      await settle(fixture);
      expect(text(fixture)).toContain('Map the columns before committing.');
      expect(await loader.getAllHarnesses(MatCheckboxHarness)).toHaveLength(0);
    });
  });

  describe('while the commit runs', () => {
    beforeEach(async () => {
      create(20);
      await settle(fixture);
    });

    it('shows the server progress in a progress bar', async () => {
      await (await commitButton()).click();
      const commit = http.expectOne('/api/imports/imp-1/commit');

      await new Promise((resolve) => setTimeout(resolve, 30));
      http.expectOne('/api/imports/imp-1/progress').flush({ phase: 'writing', done: 250, total: 1000, updatedAt: null });
      await settle(fixture);

      const bar = await loader.getHarness(MatProgressBarHarness);
      expect(await bar.getValue()).toBe(25);
      expect(text(fixture)).toContain('Writing readings: 250 of 1,000');

      // Polls sent while the commit was still running (a slow machine may send more than one);
      // match() takes them off the open list.
      http.match('/api/imports/imp-1/progress');
      commit.flush({ inserted: 1000, unchanged: 0, superseded: 0, conflicts: 0, nothingNew: false });
      await settle(fixture);
      await new Promise((resolve) => setTimeout(resolve, 40));
      // Polling stops with the commit: no further progress request is left open.
      http.expectNone('/api/imports/imp-1/progress');
      expect(results.map((r) => r.inserted)).toEqual([1000]);
    });
  });
});
