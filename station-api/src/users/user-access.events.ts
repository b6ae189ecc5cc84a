import { Injectable } from '@nestjs/common';

type Listener = (userId: number) => void;

/**
 * Tells live connections that a user's rights changed (deactivated, reactivated, roles changed), so the
 * socket gateway can re-check them at once instead of at the next join. In-process only: one server.
 */
@Injectable()
export class UserAccessEvents {
  private readonly listeners = new Set<Listener>();

  /** @returns a function that removes the listener */
  onChanged(listener: Listener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  changed(userId: number): void {
    for (const l of this.listeners) l(userId);
  }
}
