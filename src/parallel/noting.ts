/** A chart cache that notes which charts were asked for, so the cache keeps what pages use. */
import type { ChartCache } from '../report/charts/render.js';

export class NotingCache extends Map<string, string> {
  readonly asked = new Set<string>();
  constructor(private readonly inner: ChartCache) {
    super();
  }
  override get(key: string): string | undefined {
    this.asked.add(key);
    return this.inner.get(key);
  }
  override set(key: string, value: string): this {
    this.asked.add(key);
    this.inner.set(key, value);
    return this;
  }
}
