import { expandColumn, expandReview } from './review-api';
import { reviewFixture, sparse, toWire } from '../../features/review/testing/review-fixtures';

describe('expandColumn', () => {
  it('puts each exception at its index and the usual entry everywhere else', () => {
    expect(expandColumn({ usual: 0, at: [1, 4], values: [2, null] }, 6)).toEqual([0, 2, 0, 0, null, 0]);
  });

  it('gives a column of the usual entry when there is no exception', () => {
    expect(expandColumn({ usual: 1, at: [], values: [] }, 3)).toEqual([1, 1, 1]);
  });

  it('is the inverse of sending a column as its exceptions', () => {
    const column = [0, 0, 2, null, 0, 3, 0];
    expect(expandColumn(sparse(column, 0), column.length)).toEqual(column);
  });
});

describe('expandReview', () => {
  it('gives back the review whose statuses, reasons and coverages were sent as exceptions', () => {
    const review = reviewFixture();
    const wire = toWire(review);
    // The wire form is smaller: the fixture's hours are mostly valid and fully covered.
    const nox = wire.hourly.channels['ch-nox']!;
    expect(nox.status.at.length).toBeLessThan(review.hourly.count);
    expect(expandReview(wire)).toEqual(review);
  });
});
