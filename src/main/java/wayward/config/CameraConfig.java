package wayward.config;

import java.util.List;

/**
 * One {@code [[camera]]} table.
 *
 * @param id            short name used in events, logs and file names
 * @param source        a file path (already resolved) or a URL (rtsp://, http://, ...)
 * @param loop          a file source starts again from the beginning when it ends
 * @param analysisWidth width of the analysis picture in pixels; the height keeps the aspect ratio
 * @param analysisFps   most frames per second analysed; the rest are decoded and passed over
 * @param removeCameraMotion subtract the picture's dominant motion (shake) before zones are measured
 * @param zones         at least one zone
 */
public record CameraConfig(String id, String source, boolean loop, int analysisWidth, double analysisFps,
        boolean removeCameraMotion, List<ZoneConfig> zones) {
    public CameraConfig {
        zones = List.copyOf(zones);
    }

    /** The same camera reading another source (replay, demo). */
    public CameraConfig withSource(String newSource, boolean newLoop) {
        return new CameraConfig(id, newSource, newLoop, analysisWidth, analysisFps, removeCameraMotion, zones);
    }

    /** True when the source is a URL rather than a file. */
    public boolean isUrl() {
        return isUrl(source);
    }

    public static boolean isUrl(String source) {
        int i = source.indexOf("://");
        return i > 0 && source.substring(0, i).matches("[A-Za-z][A-Za-z0-9+.-]*");
    }
}
