package wayward.analysis;

import wayward.capture.CaptureMeter;

/**
 * The CPU time of the analysis thread's stages (flow; zone meters, rules and tamper checks), counted from a stream
 * time on (bench; the seconds before are JIT warm-up). Written by the analysis thread only, read by any.
 */
final class StageMeter {
    private volatile double from = Double.NaN;
    /** Analysis thread: counting has begun. */
    private boolean on;
    private volatile long flowNanos;
    private volatile long zonesNanos;
    private volatile long analysedBefore = -1;
    private volatile double streamAtStart = Double.NaN;

    void startAt(double fromSeconds) {
        from = fromSeconds;
    }

    /**
     * Analysis thread, before each frame's flow: the frame of stream time t, after {@code analysed} frames, the
     * previous at {@code previous} (NaN: none). Counting begins with the first frame at or after the start.
     */
    void frame(double t, double previous, long analysed) {
        if (!on && t >= from) {
            on = true;
            analysedBefore = analysed;
            streamAtStart = Double.isNaN(previous) ? t : previous;
        }
    }

    /** The CPU clock now, or 0 while not counting. */
    long clock() {
        return on ? CaptureMeter.cpu() : 0;
    }

    /** The flow that began at c0 is over; returns the clock, where the zones' stage begins. */
    long flowDone(long c0) {
        if (!on) {
            return 0;
        }
        long c1 = CaptureMeter.cpu();
        flowNanos += c1 - c0;
        return c1;
    }

    /** The zones' stage that began at c1 is over. */
    void zonesDone(long c1) {
        if (on) {
            zonesNanos += CaptureMeter.cpu() - c1;
        }
    }

    /** What was measured since counting began (all 0 before), with the capture thread's figures. */
    StageFigures figures(CaptureMeter capture, long analysed, double lastStreamSeconds) {
        long before = analysedBefore;
        double start = streamAtStart;
        return new StageFigures(capture.decodeCpuNanos(), capture.downscaleCpuNanos(), flowNanos, zonesNanos,
                capture.framesMeasured(), before < 0 ? 0 : analysed - before,
                Double.isNaN(start) ? 0 : lastStreamSeconds - start);
    }
}
