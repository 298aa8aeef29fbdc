import { describe, expect, it, vi } from "vitest";
import { registerServiceWorker } from "@/lib/client/service-worker";

// Registering the offline worker never throws: with service workers missing or blocked, every page
// still opens (before, each farm page threw "Cannot read properties of undefined (reading 'waiting')").

describe("registerServiceWorker", () => {
  it("registers through the build's helper when the browser has service workers", async () => {
    const register = vi.fn(async () => ({}));
    expect(await registerServiceWorker({ navigator: { serviceWorker: { register: vi.fn() } as never }, serwist: { register } })).toBe("registered");
    expect(register).toHaveBeenCalledOnce();
  });

  it("says 'unsupported' when the browser has no service workers (or the helper is not set up, as in next dev)", async () => {
    expect(await registerServiceWorker({ navigator: {} })).toBe("unsupported");
    expect(await registerServiceWorker({ navigator: { serviceWorker: { register: vi.fn() } as never } })).toBe("unsupported");
  });

  it("catches a blocked registration instead of throwing (the helper's 'reading waiting' failure)", async () => {
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    // What the helper does when register() gives nothing back: it reads `.waiting` of undefined.
    const serwist = {
      register: async () => {
        const registration = (await Promise.resolve(undefined)) as unknown as ServiceWorkerRegistration;
        return registration.waiting;
      },
    };
    await expect(registerServiceWorker({ navigator: { serviceWorker: { register: vi.fn() } as never }, serwist })).resolves.toBe("failed");
    const denied = { register: () => Promise.reject(new DOMException("The operation is insecure.", "SecurityError")) };
    await expect(registerServiceWorker({ navigator: { serviceWorker: { register: vi.fn() } as never }, serwist: denied })).resolves.toBe("failed");
    expect(warn).toHaveBeenCalledTimes(2);
    warn.mockRestore();
  });
});
