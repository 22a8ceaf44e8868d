package wayward.analysis;

/**
 * What one camera's stages cost since counting began (all 0 before): CPU nanoseconds of each stage, frames
 * decoded and analysed, and the stream seconds they covered; for a camera with two streams also the main
 * stream's demux (CPU nanoseconds, packets; 0 for one stream).
 */
public record StageFigures(double decodeNanos, double shrinkNanos, double flowNanos, double zonesNanos,
        long decodedFrames, long analysedFrames, double streamSeconds, double mainDemuxNanos, long mainPackets,
        double mainSeconds) {

    /** Figures of a camera with one stream. */
    public StageFigures(double decodeNanos, double shrinkNanos, double flowNanos, double zonesNanos,
            long decodedFrames, long analysedFrames, double streamSeconds) {
        this(decodeNanos, shrinkNanos, flowNanos, zonesNanos, decodedFrames, analysedFrames, streamSeconds, 0, 0, 0);
    }

    /** The same figures with a main stream's demux cost added (two streams). */
    public StageFigures withMainDemux(double demuxNanos, long packets, double seconds) {
        return new StageFigures(decodeNanos, shrinkNanos, flowNanos, zonesNanos, decodedFrames, analysedFrames,
                streamSeconds, demuxNanos, packets, seconds);
    }

    /** CPU nanoseconds of the analysis stream's stages together (the main stream's demux not included). */
    public double totalNanos() {
        return decodeNanos + shrinkNanos + flowNanos + zonesNanos;
    }

    /** CPU nanoseconds per second of video of every stage, the main stream's demux included. */
    public double nanosPerVideoSecond() {
        double analysis = totalNanos() / Math.max(1e-3, streamSeconds);
        return mainPackets == 0 ? analysis : analysis + mainDemuxNanos / Math.max(1e-3, mainSeconds);
    }
}
