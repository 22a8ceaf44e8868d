package wayward.capture;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;

/**
 * The CPU time a camera's capture thread spends decoding and shrinking, counted from a stream time on (the
 * bench's stage figures; the seconds before are JIT warm-up). Written by the capture thread only, read by any.
 */
public final class CaptureMeter {
    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();

    /** Stream time from which CPU is counted; NaN: not measured. */
    private volatile double from = Double.NaN;
    /** Capture thread: counting has begun (a frame at or after {@link #from} was decoded). */
    private boolean on;
    private volatile long decodeNanos;
    private volatile long downscaleNanos;
    private volatile long frames;

    /** The calling thread's CPU time, nanoseconds. */
    public static long cpu() {
        return THREADS.getCurrentThreadCpuTime();
    }

    /** Before the run: count from stream time {@code fromSeconds} on. */
    public void startAt(double fromSeconds) {
        from = fromSeconds;
    }

    /** Frames decoded since counting began (the first frame at or after the start is not counted), or 0. */
    public long framesMeasured() {
        return frames;
    }

    /** CPU nanoseconds spent decoding (send and receive), when measured. */
    public long decodeCpuNanos() {
        return decodeNanos;
    }

    /** CPU nanoseconds spent taking the luma plane and downscaling it, when measured. */
    public long downscaleCpuNanos() {
        return downscaleNanos;
    }

    /** Capture thread: a frame of stream time t was decoded; counting begins with the next one. */
    void frame(double t) {
        if (on) {
            frames++;
        } else if (t >= from) {
            on = true;
        }
    }

    /** Capture thread: the CPU clock before a measured step, or 0 while not counting. */
    long begin() {
        return on ? cpu() : 0;
    }

    /** Capture thread: a decoding step that began at {@code c0} (from {@link #begin}) is over. */
    void decoded(long c0) {
        if (on) {
            decodeNanos += cpu() - c0;
        }
    }

    /** Capture thread: a shrink that began at {@code c0} (from {@link #begin}) is over. */
    void downscaled(long c0) {
        if (on) {
            downscaleNanos += cpu() - c0;
        }
    }
}
