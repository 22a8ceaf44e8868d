package wayward.flow;

import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.locks.LockSupport;

/**
 * Runs one task in N bands at once: band 0 on the calling thread, the others on N − 1 daemon threads owned by
 * this pool, and returns when all are done. Hand-over by park/unpark on a generation counter, so a run
 * allocates nothing. One caller at a time.
 */
final class BandPool implements AutoCloseable {
    /** The work of one band. */
    interface BandTask {
        void run(int band, int bands);
    }

    /** Busy-wait rounds before parking (a few tens of microseconds). */
    private static final int SPINS = 20_000;

    private final int bands;
    private final BandTask task;
    private final Thread[] workers;
    private final AtomicInteger remaining = new AtomicInteger();
    private volatile int generation;
    private volatile Thread caller;
    private volatile boolean closed;
    private volatile RuntimeException failure;

    BandPool(int bands, BandTask task) {
        this.bands = bands;
        this.task = task;
        this.workers = new Thread[bands - 1];
        for (int i = 1; i < bands; i++) {
            final int band = i;
            Thread t = new Thread(() -> work(band), "flow-band-" + i);
            t.setDaemon(true);
            workers[i - 1] = t;
            t.start();
        }
    }

    void runAll() {
        caller = Thread.currentThread();
        failure = null;
        remaining.set(bands - 1);
        generation++;
        for (Thread t : workers) {
            LockSupport.unpark(t);
        }
        task.run(0, bands);
        int spins = 0;
        while (remaining.get() > 0) {
            // the other bands finish within microseconds of ours: spin briefly before parking
            if (++spins < SPINS) {
                Thread.onSpinWait();
            } else {
                LockSupport.park(this);
            }
        }
        RuntimeException f = failure;
        if (f != null) {
            throw f;
        }
    }

    private void work(int band) {
        int seen = 0;
        int spins = 0;
        while (!closed) {
            int g = generation;
            if (g == seen) {
                // frames arrive every 100 ms, levels within a millisecond: spin a little, then sleep
                if (++spins < SPINS) {
                    Thread.onSpinWait();
                } else {
                    LockSupport.park(this);
                }
                continue;
            }
            spins = 0;
            seen = g;
            try {
                task.run(band, bands);
            } catch (RuntimeException e) {
                failure = e;
            } finally {
                if (remaining.decrementAndGet() == 0) {
                    LockSupport.unpark(caller);
                }
            }
        }
    }

    @Override
    public void close() {
        closed = true;
        for (Thread t : workers) {
            LockSupport.unpark(t);
        }
    }
}
