package wayward.analysis;


/**
 * What the status server and reports read of a running camera: its counters and its zones' latest readings,
 * read-only and safe from any thread (the pipeline behind it is the analysis, which they never drive).
 */
public interface CameraStatus {
    String id();

    CameraConfig config();

    /**
     * One stream of a camera as the status shows it.
     *
     * @param key        the config key it comes from: {@code "source"} or {@code "analysis_source"}
     * @param address    its file or URL
     * @param decoded    true for the stream the analysis decodes; false for a main stream only demuxed for clips
     * @param width      its picture width, pixels (0 before known)
     * @param height     its picture height, pixels (0 before known)
     * @param frames     pictures decoded from it (0 for a stream only demuxed)
     * @param packets    video packets read from it (only counted for a stream only demuxed; −1 otherwise)
     * @param reconnects reconnect attempts
     * @param watching   pictures (or packets) arrive
     */
    record StreamState(String key, String address, boolean decoded, int width, int height, long frames,
            long packets, long reconnects, boolean watching) {
    }

    /** Width of the analysed stream's decoded pictures, pixels; 0 before the first. */
    default int width() {
        return 0;
    }

    /** Height of the analysed stream's decoded pictures, pixels; 0 before the first. */
    default int height() {
        return 0;
    }

    /**
     * The camera's streams: for one stream, {@code source}, decoded; with {@code analysis_source}, the main stream
     * (only demuxed) first, then the analysis stream.
     */
    default java.util.List<StreamState> streams() {
        CameraConfig c = config();
        StreamState analysed = new StreamState(c.twoStreams() ? "analysis_source" : "source", c.analysedSource(),
                true, width(), height(), framesIn(), -1, reconnects(), watching());
        StreamState main = mainStream();
        return main == null ? java.util.List.of(analysed) : java.util.List.of(main, analysed);
    }

    /**
     * A two-stream camera: its main stream's packet times on the analysis stream's axis minus their own, seconds
     * (the time mapping of {@code wayward.capture.StreamLink}); NaN for one stream or before it is known.
     */
    default double mainShiftSeconds() {
        return Double.NaN;
    }

    /** The main stream of a camera with {@code analysis_source}; null for a camera with one stream. */
    default StreamState mainStream() {
        return null;
    }

    /** Frames are coming and being analysed (the camera is not lost). */
    boolean watching();

    long framesIn();

    long analysedFrames();

    /** Analysed frames whose flow was skipped because nothing changed around the zones ({@code [flow] skip_still}). */
    long stillFrames();

    /** Frames replaced by a newer one before analysis took them. */
    long droppedFrames();

    long decodeErrors();

    long reconnects();

    /** Wall seconds spent in flow, zone meters and rules. */
    double analysisSeconds();

    /** The latest analysed frame's stream time. */
    double streamSeconds();

    /** Analysed frames per second of stream, lately. */
    double analysisFps();

    /** The heading the zone uses (configured or learned), NaN for a motion zone or one still learning. */
    double zoneHeading(int zone);

    boolean zoneLearning(int zone);

    /** The zone's latest moving share (share of its pixels moving), 0..1; NaN before the first reading. */
    double zoneMovingShare(int zone);

    /** The zone's latest share of pixels moving against its heading, 0..1; NaN before the first reading. */
    double zoneAgainstShare(int zone);

    /** Events started in the zone so far. */
    long zoneEvents(int zone);

    /** The latest frame and flow for the live view. */
    LiveView live();

    /**
     * The tamper conditions open now (a start raised, its end not yet) by their kinds' JSON names
     * ({@code view_blocked}, {@code focus_lost}, {@code picture_frozen}, {@code camera_moved}), in that order;
     * empty when none is or the camera does not watch for them. Safe from any thread.
     */
    default java.util.List<String> conditions() {
        return java.util.List.of();
    }
}
