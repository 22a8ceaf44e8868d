package wayward.analysis;

import java.util.List;
import wayward.capture.SourceInput;
import wayward.secret.Urls;

/**
 * One {@code [[camera]]} table.
 *
 * @param id            short name used in events, logs and file names
 * @param source        a file path (already resolved) or a URL (rtsp://, http://, ...)
 * @param loop          a file source starts again from the beginning when it ends
 * @param analysisWidth width of the analysis picture in pixels; the height keeps the aspect ratio
 * @param analysisFps   most frames per second analysed; the rest are decoded and passed over
 * @param removeCameraMotion subtract the picture's dominant motion (shake) before zones are measured
 * @param input         how to open the source (transport, webcam size/rate/format)
 * @param zones         at least one zone
 * @param tamperAlerts  raise view_blocked, focus_lost, picture_frozen and camera_moved events
 * @param analysisSource the camera's second, smaller stream ({@code analysis_source}): a file path (already
 *                      resolved) or a URL; the analysis decodes only it, and {@code source} is then only demuxed
 *                      for the pre-roll ring and the clips. Null for a camera with one stream.
 */
public record CameraConfig(String id, String source, boolean loop, int analysisWidth, double analysisFps,
        boolean removeCameraMotion, SourceInput input, List<ZoneConfig> zones, boolean tamperAlerts,
        String analysisSource) {
    /** Width the picture is shrunk to for analysis, pixels ({@code analysis_width}). */
    public static final int DEFAULT_ANALYSIS_WIDTH = 320;
    /** Most frames analysed per second ({@code analysis_fps}); others are decoded and passed over. */
    public static final double DEFAULT_ANALYSIS_FPS = 10;


    public CameraConfig {
        zones = List.copyOf(zones);
    }

    /** A camera with one stream, decoded for analysis and copied for clips. */
    public CameraConfig(String id, String source, boolean loop, int analysisWidth, double analysisFps,
            boolean removeCameraMotion, SourceInput input, List<ZoneConfig> zones, boolean tamperAlerts) {
        this(id, source, loop, analysisWidth, analysisFps, removeCameraMotion, input, zones, tamperAlerts, null);
    }

    /** The same camera reading one other source (replay, bench): its analysis_source is left out. */
    public CameraConfig withSource(String newSource, boolean newLoop) {
        return withSources(newSource, null, newLoop);
    }

    /** The same camera reading other sources ({@code newAnalysisSource} null for one stream). */
    public CameraConfig withSources(String newSource, String newAnalysisSource, boolean newLoop) {
        return new CameraConfig(id, newSource, newLoop, analysisWidth, analysisFps, removeCameraMotion, input, zones,
                tamperAlerts, newAnalysisSource);
    }

    /** True when the camera has two streams: {@code analysis_source} for analysis, {@code source} for clips. */
    public boolean twoStreams() {
        return analysisSource != null;
    }

    /** The stream the analysis decodes: {@code analysis_source} when set, else {@code source}. */
    public String analysedSource() {
        return analysisSource != null ? analysisSource : source;
    }

    /** True when the source is a URL rather than a file. */
    public boolean isUrl() {
        return Urls.isUrl(source);
    }
}
