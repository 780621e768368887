import { describe, expect, it } from 'vitest';
import { FakeApiError } from './errors';
import { newId, PaymentsStore } from './store';

const items = Array.from({ length: 5 }, (_, i) => ({ id: `obj_${i + 1}` })); // obj_5 is the newest

describe('PaymentsStore.list', () => {
  const store = new PaymentsStore();

  it('lists newest first, limit 10 by default, with has_more', () => {
    const page = store.list(items, { limit: 2 }, '/v1/x');
    expect(page).toEqual({ object: 'list', data: [{ id: 'obj_5' }, { id: 'obj_4' }], has_more: true, url: '/v1/x' });
    expect(store.list(items, {}, '/v1/x').has_more).toBe(false);
  });

  it('pages forward with starting_after and backward with ending_before', () => {
    expect(store.list(items, { limit: 2, starting_after: 'obj_4' }, '/v1/x').data.map((i) => i.id)).toEqual(['obj_3', 'obj_2']);
    const last = store.list(items, { limit: 2, starting_after: 'obj_2' }, '/v1/x');
    expect(last.data.map((i) => i.id)).toEqual(['obj_1']);
    expect(last.has_more).toBe(false);
    const back = store.list(items, { limit: 2, ending_before: 'obj_2' }, '/v1/x');
    expect(back.data.map((i) => i.id)).toEqual(['obj_4', 'obj_3']);
    expect(back.has_more).toBe(true);
  });

  it('filters before paging, so has_more speaks of the filtered list', () => {
    const odd = store.list(items, { limit: 3 }, '/v1/x', (i) => Number(i.id.slice(4)) % 2 === 1);
    expect(odd.data.map((i) => i.id)).toEqual(['obj_5', 'obj_3', 'obj_1']);
    expect(odd.has_more).toBe(false);
  });

  it('answers an unknown cursor with resource_missing on that parameter', () => {
    try {
      store.list(items, { starting_after: 'obj_9' }, '/v1/x');
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(FakeApiError);
      expect((error as FakeApiError).body).toMatchObject({ code: 'resource_missing', param: 'starting_after' });
    }
  });
});

describe('PaymentsStore.expand', () => {
  it('replaces an id with the object it names, without changing the stored object', () => {
    const store = new PaymentsStore();
    const txn = { id: 'txn_1', object: 'balance_transaction', fee: 59 };
    const charge = { id: 'ch_1', object: 'charge', balance_transaction: 'txn_1' };
    store.collections.balanceTransactions.set('txn_1', txn as never);
    store.collections.charges.set('ch_1', charge as never);
    const expanded = store.expand(charge, ['balance_transaction']);
    expect(expanded.balance_transaction).toEqual(txn);
    expect(charge.balance_transaction).toBe('txn_1');
  });

  it('refuses a property that is not there', () => {
    const store = new PaymentsStore();
    expect(() => store.expand({ id: 'x' }, ['nothing'])).toThrow(/cannot be expanded \(nothing\)/);
  });
});

describe('newId', () => {
  it('uses the prefix, an underscore and 24 base-62 characters', () => {
    expect(newId('pi')).toMatch(/^pi_[0-9A-Za-z]{24}$/);
    expect(newId('pi')).not.toBe(newId('pi'));
  });
});
