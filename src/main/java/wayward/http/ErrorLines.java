package wayward.http;

import org.slf4j.Logger;

/**
 * At most {@link #LINES_PER_MINUTE} error lines a minute: a flood of bad requests must not fill the log. The
 * lines held back are counted and reported in one line when the next minute's first line is written. Any thread.
 */
final class ErrorLines {
    static final int LINES_PER_MINUTE = 10;
    private static final long MINUTE_NANOS = 60_000_000_000L;

    private final Logger log;
    private long windowStart = Long.MIN_VALUE;
    private int lines;
    private long held;

    ErrorLines(Logger log) {
        this.log = log;
    }

    /** Logs {@code line} (already fit for the log) at error level unless this minute's lines are used up. */
    void error(String line, long nowNanos) {
        synchronized (this) {
            if (windowStart == Long.MIN_VALUE || nowNanos - windowStart >= MINUTE_NANOS) {
                if (held > 0) {
                    log.warn("status server: {} more error lines held back in the last minute", held);
                }
                windowStart = nowNanos;
                lines = 0;
                held = 0;
            }
            if (lines >= LINES_PER_MINUTE) {
                held++;
                return;
            }
            lines++;
        }
        log.error(line);
    }
}
