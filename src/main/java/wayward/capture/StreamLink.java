package wayward.capture;

/**
 * Puts a two-stream camera's main-stream packets on its analysis stream's time axis, so clips copied from the
 * main stream are cut where the analysis (whose stream time the rules and events use) asks.
 *
 * <p>Both streams come from one camera clock, but FFmpeg gives each stream only its own timestamps, with an
 * origin of its own. Each stream's timestamps are therefore tied to the monotonic clock ({@link System#nanoTime})
 * of this process: per stream, the offset {@code arrival − stream time} of every packet (main) or picture
 * (analysis) is taken, and the smallest of them over the last {@value #WINDOW_SECONDS} to
 * {@code 2 × }{@value #WINDOW_SECONDS} seconds stands for the stream's offset. Network and buffering delays only
 * ever add to an arrival, so the smallest offset is the one least delayed (the minimum filter of network clock
 * synchronisation, as NTP uses it); windowing lets it follow a slow drift of the camera's clock against ours.
 * A main packet's time on the analysis axis is then {@code mainSeconds + mainOffset − analysisOffset}. The
 * offsets are started afresh at every (re)connect of their stream (its time origin changes).
 *
 * <p>A pair of files is different: they are recordings cut together, so the main file's own timestamps are the
 * analysis file's (both continued alike across loops), and the main file is paced to the analysis stream's
 * clock ({@link #analysisNanosAt}) rather than to its own start, so both play in step even when one took longer
 * to open. Each opens on its own, so paced to its own start a pair would drift apart by the difference of
 * their opening times (up to a second was seen with 16 cameras on a busy machine).
 *
 * <p>Threads: the analysis stream's capture thread calls {@link #analysisOpened} and {@link #analysisFrame};
 * the main stream's capture thread calls the rest. The analysis side publishes its offset and pass through
 * volatile fields; nothing allocates.
 */
public final class StreamLink {
    /** Length of one window of the minimum filter, seconds. */
    static final double WINDOW_SECONDS = 10;
    private static final long WINDOW_NANOS = (long) (WINDOW_SECONDS * 1e9);

    /** Analysis side: offset in seconds (NaN before its first picture of a pass) and pass count. */
    private volatile double analysisOffsetSeconds = Double.NaN;
    private volatile long analysisPass;
    /** The analysis stream's reading has ended for good (its file's end, or the camera stopping). */
    private volatile boolean analysisEnded;
    // analysis capture thread only
    private final MinWindow analysis = new MinWindow();
    // main capture thread only
    private final MinWindow main = new MinWindow();

    /** Analysis capture thread: the analysis stream was (re)opened; its time axis was spliced. */
    void analysisOpened() {
        analysis.reset();
        analysisOffsetSeconds = Double.NaN;
        analysisPass++;
    }

    /**
     * Analysis capture thread: a picture of stream time {@code streamSeconds} is ready (after pacing, if any) at
     * monotonic time {@code nanos}.
     */
    void analysisFrame(long nanos, double streamSeconds) {
        analysisOffsetSeconds = analysis.add(nanos, nanos / 1e9 - streamSeconds);
    }

    /** Analysis capture thread: its reading has ended for good. */
    void analysisEnded() {
        analysisEnded = true;
    }

    /** Any thread: true once the analysis stream's reading has ended for good. */
    boolean analysisHasEnded() {
        return analysisEnded;
    }

    /** Any thread: how many times the analysis stream was opened; a change means its time axis was spliced. */
    long analysisPass() {
        return analysisPass;
    }

    /**
     * Any thread: the monotonic time, nanoseconds, at which the analysis stream delivers (delivered) stream time
     * {@code streamSeconds} in its current pass, by its offset; {@link Long#MIN_VALUE} before its first picture of
     * the pass. A pair of files played as a camera paces its main stream by it, so both play in step.
     */
    long analysisNanosAt(double streamSeconds) {
        double offset = analysisOffsetSeconds;
        return Double.isNaN(offset) ? Long.MIN_VALUE : (long) ((offset + streamSeconds) * 1e9);
    }

    /** Main capture thread: the main stream was (re)opened; its own time origin changed. */
    void mainOpened() {
        main.reset();
    }

    /**
     * Main capture thread: the analysis stream time of a main packet of main stream time {@code mainSeconds}
     * (seconds since the main stream's first packet of this pass) that arrived at monotonic time {@code nanos};
     * NaN while the analysis stream has given no picture in its current pass.
     */
    double mainToAnalysis(long nanos, double mainSeconds) {
        double mainOffset = main.add(nanos, nanos / 1e9 - mainSeconds);
        return mainSeconds + mainOffset - analysisOffsetSeconds;
    }

    /** The smallest value over the current and the previous window of {@link #WINDOW_NANOS}. */
    static final class MinWindow {
        private double current = Double.POSITIVE_INFINITY;
        private double previous = Double.POSITIVE_INFINITY;
        private long windowStartNanos;
        private boolean started;

        void reset() {
            current = Double.POSITIVE_INFINITY;
            previous = Double.POSITIVE_INFINITY;
            started = false;
        }

        /** Adds {@code value} seen at {@code nanos}; returns the smallest over the last one to two windows. */
        double add(long nanos, double value) {
            if (!started) {
                started = true;
                windowStartNanos = nanos;
            } else if (nanos - windowStartNanos >= WINDOW_NANOS) {
                previous = current;
                current = Double.POSITIVE_INFINITY;
                windowStartNanos = nanos;
            }
            current = Math.min(current, value);
            return Math.min(current, previous);
        }
    }
}
