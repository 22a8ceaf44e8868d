package wayward.capture;

import java.util.function.LongSupplier;

/**
 * One camera's stream time, which the rules run on: seconds since its first frame, from the source's own
 * timestamps, continued one frame interval after the last frame when a file loops or a live source is opened
 * again, and spliced on at one frame interval where the timestamps jump (backwards, or forwards by more than
 * {@link #MAX_FORWARD_JUMP_SECONDS}: a wrap, a concatenation, a camera restart). A live source whose container
 * has no real timestamps (multipart JPEG over HTTP, where FFmpeg makes them up at an assumed rate) runs on the
 * wall clock instead, strictly increasing. Packets (for clips) and frames (for analysis) read the same clock.
 * Capture thread only.
 */
final class StreamClock {
    /** An absent timestamp (FFmpeg's AV_NOPTS_VALUE). */
    static final long NONE = Long.MIN_VALUE;
    /** A forward jump between two frames larger than this, seconds, is spliced, not kept as a gap. */
    static final double MAX_FORWARD_JUMP_SECONDS = 10;
    /** Step that keeps wall-clock times strictly increasing, seconds. */
    private static final double MIN_STEP_SECONDS = 1e-3;

    private final boolean live;
    private final LongSupplier nanoTime;
    private boolean untimedFormat;
    private boolean wallStarted;
    private long wallStartNanos;
    private double wallOffset;
    private double lastPacketSeconds = -1;
    private double firstSeconds = Double.NaN;
    private double offsetSeconds;
    private double lastSeconds = -1;
    private double nominalFrameSeconds = 1.0 / 25;

    /**
     * @param live     a camera (network or device), not a file
     * @param nanoTime the monotonic clock ({@code System::nanoTime}; tests give their own)
     */
    StreamClock(boolean live, LongSupplier nanoTime) {
        this.live = live;
        this.nanoTime = nanoTime;
    }

    /**
     * A source was opened.
     *
     * @param untimedContainer    its container makes its timestamps up (multipart JPEG)
     * @param nominalFrameSeconds its nominal frame interval; NaN or not above 0 keeps the last known (1/25 s
     *                            at first)
     */
    void opened(boolean untimedContainer, double nominalFrameSeconds) {
        this.untimedFormat = untimedContainer;
        if (nominalFrameSeconds > 0) {
            this.nominalFrameSeconds = nominalFrameSeconds;
        }
        wallStarted = false;
    }

    /** A pass ended (a file's end before it loops, a live source lost): the next one continues after it. */
    void nextPass() {
        offsetSeconds = lastSeconds + nominalFrameSeconds;
        firstSeconds = Double.NaN;
    }

    /** Stream time of a packet from its presentation (or decoding) timestamp, {@link #NONE} if it has none. */
    double packetSeconds(long ts, double timeBase) {
        if (onWallClock()) {
            lastPacketSeconds = wallSeconds(lastPacketSeconds);
            return lastPacketSeconds;
        }
        if (ts == NONE) {
            return Math.max(0, lastSeconds);
        }
        double raw = ts * timeBase;
        if (Double.isNaN(firstSeconds)) {
            firstSeconds = raw;
        }
        return raw - firstSeconds + offsetSeconds;
    }

    /** Stream time of a decoded frame from its best-effort timestamp ({@link #NONE}: one interval on). */
    double frameSeconds(long ts, double timeBase) {
        double t;
        if (onWallClock()) {
            t = wallSeconds(lastSeconds);
        } else if (ts == NONE) {
            t = lastSeconds < 0 ? 0 : lastSeconds + nominalFrameSeconds;
        } else {
            double raw = ts * timeBase;
            if (Double.isNaN(firstSeconds)) {
                firstSeconds = raw;
            }
            t = raw - firstSeconds + offsetSeconds;
            if (t <= lastSeconds || (t > lastSeconds + MAX_FORWARD_JUMP_SECONDS && lastSeconds >= 0)) {
                offsetSeconds += lastSeconds + nominalFrameSeconds - t;
                t = lastSeconds + nominalFrameSeconds;
            }
        }
        lastSeconds = t;
        return t;
    }

    /** The last frame's stream time; −1 before the first. */
    double lastSeconds() {
        return lastSeconds;
    }

    double nominalFrameSeconds() {
        return nominalFrameSeconds;
    }

    private boolean onWallClock() {
        return live && untimedFormat;
    }

    /** Wall-clock stream time, started where the last frame left off, and after {@code after}. */
    private double wallSeconds(double after) {
        long now = nanoTime.getAsLong();
        if (!wallStarted) {
            wallStarted = true;
            wallStartNanos = now;
            wallOffset = Math.max(0, lastSeconds + nominalFrameSeconds);
        }
        return Math.max(wallOffset + (now - wallStartNanos) / 1e9, after + MIN_STEP_SECONDS);
    }
}
