package wayward.retry;

import java.util.concurrent.ThreadLocalRandom;

/**
 * Exponential backoff with jitter, one instance per thing that retries (a camera's reconnects, a destination's
 * deliveries, a broker's connection): each wait is the current step plus up to a quarter of it at random (so
 * that many cameras or destinations that failed together do not come back in step), and the step then doubles,
 * up to a ceiling; a success resets it. Not thread-safe: each user calls it from its own thread or event loop.
 */
public final class Backoff {
    private final long baseMillis;
    private final long maxMillis;
    private long stepMillis;

    /**
     * @param baseMillis first step, milliseconds (at least 1)
     * @param maxMillis  ceiling of the step; a value below {@code baseMillis} counts as {@code baseMillis}
     */
    public Backoff(long baseMillis, long maxMillis) {
        if (baseMillis < 1) {
            throw new IllegalArgumentException("baseMillis: " + baseMillis + " (expected at least 1)");
        }
        this.baseMillis = baseMillis;
        this.maxMillis = Math.max(baseMillis, maxMillis);
        this.stepMillis = baseMillis;
    }

    /** The wait before the next attempt, milliseconds: the step plus 0 to a quarter of it; the step then doubles. */
    public long nextMillis() {
        long wait = stepMillis + ThreadLocalRandom.current().nextLong(stepMillis / 4 + 1);
        stepMillis = Math.min(stepMillis * 2, maxMillis);
        return wait;
    }

    /** After a success: the next wait starts again from the first step. */
    public void reset() {
        stepMillis = baseMillis;
    }

    /** The step the next wait starts from, milliseconds. */
    public long stepMillis() {
        return stepMillis;
    }

    /** The ceiling of the step, milliseconds. */
    public long maxMillis() {
        return maxMillis;
    }
}
