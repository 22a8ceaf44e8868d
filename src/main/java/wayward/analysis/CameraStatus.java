package wayward.analysis;


/**
 * What the status server and reports read of a running camera: its counters and its zones' latest readings,
 * read-only and safe from any thread (the pipeline behind it is the analysis, which they never drive).
 */
public interface CameraStatus {
    String id();

    CameraConfig config();

    /**
     * A two-stream camera's main stream ({@code source}), which is only demuxed: its picture size from the codec
     * parameters, packets read, pictures decoded (always 0), reconnects, and whether packets arrive.
     */
    record MainStream(int width, int height, long packets, long decodedFrames, long reconnects, boolean watching) {
    }

    /** Frames are coming and being analysed (the camera is not lost). */
    boolean watching();

    /** Width of the analysed stream's decoded pictures, pixels; 0 before the first. */
    default int width() {
        return 0;
    }

    /** Height of the analysed stream's decoded pictures, pixels; 0 before the first. */
    default int height() {
        return 0;
    }

    /** The main stream of a camera with {@code analysis_source}; null for a camera with one stream. */
    default MainStream mainStream() {
        return null;
    }

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
}
