/** Objects of one kind in creation order; lists read them newest first, as the provider lists them. */
export class Collection<T extends { id: string }> {
  private readonly byId = new Map<string, T>();
  private order: T[] = [];

  add(item: T): T {
    this.byId.set(item.id, item);
    this.order.push(item);
    return item;
  }

  get(id: string): T | undefined {
    return this.byId.get(id);
  }

  remove(id: string): void {
    this.byId.delete(id);
    this.order = this.order.filter((item) => item.id !== id);
  }

  newestFirst(filter: (item: T) => boolean = () => true): T[] {
    const out: T[] = [];
    for (let i = this.order.length - 1; i >= 0; i--) {
      const item = this.order[i] as T;
      if (filter(item)) out.push(item);
    }
    return out;
  }

  clear(): void {
    this.byId.clear();
    this.order = [];
  }

  /** The objects in creation order, for the state file (the live objects: serialise, don't change). */
  toSnapshot(): T[] {
    return [...this.order];
  }

  /** Takes over objects read back from the state file, in creation order. */
  restoreSnapshot(items: readonly T[]): void {
    this.clear();
    for (const item of items) {
      if (this.byId.has(item.id)) throw new RangeError(`${item.id} appears twice`);
      this.add(item);
    }
  }
}
