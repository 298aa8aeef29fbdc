// Memos for the round: thousands of bags ask the same question with the same inputs.

/**
 * Values remembered by a tuple of inputs, each compared as a Map key is (strings by value, objects by identity,
 * null and undefined apart), so two different tuples never share a value and no key string is built per look-up.
 * Every tuple given to one memo has the same length.
 */
export class TupleMemo<V> {
  private readonly root = new Map<unknown, unknown>();

  private leaf(keys: readonly unknown[], create: boolean): Map<unknown, unknown> | undefined {
    let map = this.root;
    for (let i = 0; i < keys.length - 1; i++) {
      let next = map.get(keys[i]) as Map<unknown, unknown> | undefined;
      if (!next) {
        if (!create) return undefined;
        map.set(keys[i], (next = new Map()));
      }
      map = next;
    }
    return map;
  }

  /** The value remembered for these inputs, or undefined. */
  find(keys: readonly unknown[]): V | undefined {
    return this.leaf(keys, false)?.get(keys[keys.length - 1]) as V | undefined;
  }

  remember(keys: readonly unknown[], value: V): V {
    this.leaf(keys, true)!.set(keys[keys.length - 1], value);
    return value;
  }
}
