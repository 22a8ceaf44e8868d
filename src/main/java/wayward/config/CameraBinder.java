package wayward.config;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.function.Function;
import org.tomlj.TomlArray;
import wayward.capture.SourceInput;
import wayward.capture.Sources;
import wayward.delivery.MqttTopics;
import wayward.rule.MoverRuleSettings;
import wayward.rule.RuleSettings;
import wayward.secret.Urls;
import wayward.analysis.CameraConfig;
import wayward.analysis.ZoneConfig;
import wayward.analysis.ZoneHours;

/**
 * Binds the [[camera]] tables and their [[camera.zone]] tables: the source and how it is read, the analysis size
 * and rate, and each zone's polygon with either a heading (movers) or share levels (any motion). Stateless.
 */
final class CameraBinder {
    private CameraBinder() {
    }

    /** The cameras in file order; at least one is required, and ids must differ. */
    static List<CameraConfig> cameras(TableReader top, Path base, ZoneId timeZone) {
        List<TableReader> tables = top.entries("camera");
        if (tables.isEmpty() && !top.has("camera")) {
            top.errorAtTable("camera", "missing (expected at least one [[camera]] table)");
        }
        return bindAll(tables, s -> camera(s, base, timeZone), CameraConfig::id, "an id no other camera has");
    }

    private static CameraConfig camera(TableReader s, Path base, ZoneId timeZone) {
        String id = s.requiredId("id");
        if (id != null && MqttTopics.RESERVED_CAMERA_IDS.contains(id)) {
            s.error("id", id, "an id other than " + String.join(", ", MqttTopics.RESERVED_CAMERA_IDS.stream().sorted()
                    .toList()) + ": MQTT topics use it as a fixed level (<prefix>/" + MqttTopics.STATUS_LEVEL
                    + "/<client id>, <prefix>/" + MqttTopics.COMMAND_LEVEL + "/<user>/…, <prefix>/"
                    + MqttTopics.MUTES_LEVEL + "/<camera>/…)");
            id = null;
        }
        String source = s.requiredString("source", "a video file path or a URL such as rtsp://host/stream");
        boolean loop = s.bool("loop", false);
        if (source != null && Sources.isDevice(source)) {
            if (loop) {
                s.error("loop", true, "false for a webcam; only files can loop");
            }
        } else if (source != null && !Urls.isUrl(source)) {
            Path p = base.resolve(source).normalize();
            if (!Files.isRegularFile(p)) {
                s.error("source", source, "a video file that exists (looked for " + p + ") or a URL");
            }
            source = p.toString();
        } else if (source != null && loop) {
            s.error("loop", true, "false for a URL source; only files can loop");
        }
        if (source != null && Urls.reservedInPassword(source) != 0) {
            char c = Urls.reservedInPassword(source);
            s.error("source", Urls.mask(source), "a password with '" + c + "' written as %"
                    + String.format(java.util.Locale.ROOT, "%02X", (int) c) + " (the characters / ? # in a password"
                    + " must be percent-encoded; FFmpeg reads a raw one as the end of the address)");
        }
        String analysisSource = analysisSource(s, base, source);
        int width = s.integer("analysis_width", CameraConfig.DEFAULT_ANALYSIS_WIDTH, 32, 1920);
        if (width % 2 != 0) {
            s.error("analysis_width", width, "an even number from 32 to 1920");
        }
        double fps = s.number("analysis_fps", CameraConfig.DEFAULT_ANALYSIS_FPS, 0.5, 60);
        boolean removeCameraMotion = s.bool("remove_camera_motion", true);
        boolean tamperAlerts = s.bool("tamper_alerts", true);
        SourceInput input = input(s, source);
        List<TableReader> zoneTables = s.entries("zone");
        if (zoneTables.isEmpty()) {
            s.errorAtTable("zone", "missing (expected at least one [[camera.zone]] table)");
        }
        List<ZoneConfig> zones = bindAll(zoneTables, z -> zone(z, timeZone), ZoneConfig::id,
                "an id no other zone of this camera has");
        s.finish();
        if (id == null || source == null) {
            return null;
        }
        return new CameraConfig(id, source, loop, width, fps, removeCameraMotion, input, zones, tamperAlerts,
                analysisSource);
    }

    /**
     * The optional second stream the analysis decodes ({@code analysis_source}): of the same kind as the source
     * (both files or both URLs; a webcam has one stream), another stream than it, a file that exists. Null when
     * absent or wrong (reported).
     *
     * @param source the camera's source as bound (a file already resolved), or null when it was wrong
     */
    private static String analysisSource(TableReader s, Path base, String source) {
        String expected = "the camera's smaller stream: a video file path or a URL such as rtsp://host/stream2";
        String a = s.string("analysis_source", null, expected);
        if (a == null) {
            return null;
        }
        if (Sources.isDevice(a) || (source != null && Sources.isDevice(source))) {
            s.error("analysis_source", a, "no analysis_source for a webcam (/dev/videoN sends one stream)");
            return null;
        }
        if (Urls.isUrl(a)) {
            if (Urls.reservedInPassword(a) != 0) {
                char c = Urls.reservedInPassword(a);
                s.error("analysis_source", Urls.mask(a), "a password with '" + c + "' written as %"
                        + String.format(java.util.Locale.ROOT, "%02X", (int) c) + " (the characters / ? # in a "
                        + "password must be percent-encoded; FFmpeg reads a raw one as the end of the address)");
                return null;
            }
            if (source != null && !Urls.isUrl(source)) {
                s.error("analysis_source", Urls.mask(a), "a video file like source (both streams of a camera are "
                        + "files, or both URLs)");
                return null;
            }
            if (a.equals(source)) {
                s.error("analysis_source", Urls.mask(a), "a stream other than source (the camera's sub-stream)");
                return null;
            }
            return a;
        }
        if (source != null && Urls.isUrl(source)) {
            s.error("analysis_source", a, "a URL like source (both streams of a camera are files, or both URLs)");
            return null;
        }
        Path p = base.resolve(a).normalize();
        if (!Files.isRegularFile(p)) {
            s.error("analysis_source", a, "a video file that exists (looked for " + p + ") or a URL");
            return null;
        }
        if (p.toString().equals(source)) {
            s.error("analysis_source", a, "a stream other than source (the camera's sub-stream)");
            return null;
        }
        return p.toString();
    }

    /**
     * How the source is opened: RTSP transport, how long a silent network source is waited for, and a webcam's
     * size, rate and format (only for webcams).
     */
    private static SourceInput input(TableReader s, String source) {
        SourceInput d = SourceInput.DEFAULTS;
        String transport = s.string("rtsp_transport", d.rtspTransport(), "\"tcp\" or \"udp\"");
        if (!transport.equals("tcp") && !transport.equals("udp")) {
            s.error("rtsp_transport", transport, "\"tcp\" or \"udp\"");
            transport = d.rtspTransport();
        }
        String deviceSize = s.string("device_size", null, "a size such as \"1280x720\"");
        if (deviceSize != null && !deviceSize.matches("[1-9][0-9]{1,4}x[1-9][0-9]{1,4}")) {
            s.error("device_size", deviceSize, "a size such as \"1280x720\"");
            deviceSize = null;
        }
        double deviceFps = s.has("device_fps") ? s.number("device_fps", 0, 1, 240) : 0;
        String formatExpected = "a Video4Linux2 input format such as \"mjpeg\" or \"yuyv422\"";
        String deviceFormat = s.string("device_format", null, formatExpected);
        if (deviceFormat != null && !deviceFormat.matches("[a-z0-9_]{2,20}")) {
            s.error("device_format", deviceFormat, formatExpected);
            deviceFormat = null;
        }
        double lostAfter = s.number("lost_after_seconds", d.lostAfterSeconds(), SourceInput.MIN_LOST_AFTER_SECONDS,
                SourceInput.MAX_LOST_AFTER_SECONDS);
        if (source != null && !Sources.isDevice(source)) {
            for (String k : new String[] {"device_size", "device_fps", "device_format"}) {
                if (s.raw(k) != null) {
                    s.error(k, s.raw(k), "no such key for a source that is not a webcam (/dev/videoN)");
                }
            }
        }
        return new SourceInput(transport, deviceSize, deviceFps, deviceFormat, lostAfter);
    }

    private static ZoneConfig zone(TableReader z, ZoneId timeZone) {
        String id = z.requiredId("id");
        double[][] polygon = z.polygon("polygon");
        double heading = Double.NaN;
        if (z.has("heading_deg")) {
            String expected = "a bearing from 0 up to, not including, 360 degrees clockwise from image-up";
            heading = z.number("heading_deg", Double.NaN, 0, 360, expected);
            if (heading == 360) {
                z.error("heading_deg", z.raw("heading_deg"), expected);
                heading = Double.NaN;
            }
        }
        double tolerance = z.number("tolerance_deg", ZoneConfig.DEFAULT_TOLERANCE_DEG, 0, 90);
        double minSpeed = z.number("min_speed", ZoneConfig.DEFAULT_MIN_SPEED, 0, 10000);
        double minConfidence = z.number("min_confidence", ZoneConfig.DEFAULT_MIN_CONFIDENCE, 0, 100000);
        double learn = z.number("learn_heading_seconds", 0, 0, 86400);
        if (learn > 0 && !Double.isNaN(heading)) {
            z.error("learn_heading_seconds", z.raw("learn_heading_seconds"), "no learning when heading_deg is set "
                    + "(leave out one of them)");
            learn = 0;
        }
        boolean movers = !Double.isNaN(heading) || learn > 0;
        double hold = z.number("hold_seconds", MoverRuleSettings.DEFAULT_HOLD_SECONDS, 0, 600);
        double clear = z.number("clear_seconds", MoverRuleSettings.DEFAULT_CLEAR_SECONDS, 0, 600);
        double rest = z.number("rest_seconds", MoverRuleSettings.DEFAULT_REST_SECONDS, 0, 3600);
        double onset = 0.02;
        double release = 0.008;
        double minTravel = ZoneConfig.DEFAULT_MIN_TRAVEL_PX;
        double quickTravel = ZoneConfig.DEFAULT_QUICK_TRAVEL_PX;
        double minArea = MoverRuleSettings.DEFAULT_MIN_MOVER_AREA_PX;
        if (movers) {
            // a zone with a heading decides on movers: shares of the zone no longer start its events
            for (String k : new String[] {"onset_level", "release_level"}) {
                z.refuse(k, "no such key for a zone with a heading: it decides on movers (min_mover_area_px, "
                        + "min_travel_px, quick_travel_px, hold_seconds), not on shares of the zone");
            }
            minTravel = z.number("min_travel_px", ZoneConfig.DEFAULT_MIN_TRAVEL_PX, 1, 10000);
            quickTravel = z.number("quick_travel_px", ZoneConfig.DEFAULT_QUICK_TRAVEL_PX, 1, 10000);
            if (quickTravel < minTravel) {
                z.error("quick_travel_px", z.raw("quick_travel_px") != null ? z.raw("quick_travel_px") : quickTravel,
                        "at least min_travel_px " + TomlText.format(minTravel));
                quickTravel = minTravel;
            }
            minArea = z.number("min_mover_area_px", MoverRuleSettings.DEFAULT_MIN_MOVER_AREA_PX, 0, 1000000);
        } else {
            onset = z.number("onset_level", onset, 0.0001, 1);
            release = z.number("release_level", Math.min(onset, release), 0, 1);
            if (release > onset) {
                z.error("release_level", release, "at most onset_level " + TomlText.format(onset));
                release = onset;
            }
            for (String k : new String[] {"min_travel_px", "quick_travel_px", "min_mover_area_px"}) {
                z.refuse(k, "no such key for a zone without a heading: it reports any motion by onset_level and "
                        + "release_level (set heading_deg or learn_heading_seconds to decide on movers)");
            }
        }
        ZoneHours hours = hours(z, timeZone);
        z.finish();
        if (id == null || polygon == null) {
            return null;
        }
        return new ZoneConfig(id, polygon[0], polygon[1], heading, tolerance, minSpeed, minConfidence,
                new RuleSettings(Math.max(onset, 0.0001), Math.max(0, Math.min(release, onset)), hold, clear, rest,
                        minTravel, quickTravel), learn,
                new MoverRuleSettings(hold, clear, rest, minTravel, quickTravel, minArea), hours);
    }

    /**
     * A zone's {@code hours} and {@code off_dates} in the site's time zone; null when absent, or wrong (reported
     * once per wrong entry).
     */
    private static ZoneHours hours(TableReader z, ZoneId timeZone) {
        Object hoursValue = z.raw("hours");
        Object datesValue = z.raw("off_dates");
        if (hoursValue == null) {
            if (datesValue != null) {
                z.error("off_dates", datesValue, "hours set as well (off dates are exceptions to a zone's hours)");
            }
            return null;
        }
        boolean ok = true;
        List<ZoneHours.Range> ranges = new ArrayList<>();
        if (!(hoursValue instanceof TomlArray a) || a.isEmpty()) {
            z.error("hours", hoursValue, "a list of ranges such as [\"mon-fri 06:00-22:00\", \"sat 07:00-12:00\"]");
            ok = false;
        } else {
            for (int i = 0; i < a.size(); i++) {
                try {
                    if (!(a.get(i) instanceof String text)) {
                        throw new IllegalArgumentException(ZoneHours.RANGE_EXPECTED);
                    }
                    ranges.add(ZoneHours.parseRange(text));
                } catch (IllegalArgumentException e) {
                    z.errorAtItem("hours", a, i, e.getMessage());
                    ok = false;
                }
            }
        }
        List<LocalDate> dates = new ArrayList<>();
        String dateExpected = "a local date such as 2026-12-24 (a TOML date, without quotes)";
        if (datesValue instanceof TomlArray a) {
            for (int i = 0; i < a.size(); i++) {
                if (a.get(i) instanceof LocalDate d) {
                    dates.add(d);
                } else {
                    z.errorAtItem("off_dates", a, i, dateExpected);
                    ok = false;
                }
            }
        } else if (datesValue != null) {
            z.error("off_dates", datesValue, "a list of local dates such as [2026-12-24, 2026-12-25]");
            ok = false;
        }
        if (timeZone == null) {
            z.error("hours", hoursValue, "[service] time_zone set as well (the hours are local times of the site, "
                    + "in a time zone such as \"Europe/Berlin\")");
            ok = false;
        }
        return ok ? new ZoneHours(timeZone, ranges, dates) : null;
    }

    /** Binds each table in order; a table that did not bind (reported) is left out, a repeated id reported. */
    private static <T> List<T> bindAll(List<TableReader> tables, Function<TableReader, T> bind,
            Function<T, String> id, String unique) {
        List<T> out = new ArrayList<>();
        Set<String> ids = new HashSet<>();
        for (TableReader t : tables) {
            T bound = bind.apply(t);
            if (bound != null) {
                if (!ids.add(id.apply(bound))) {
                    t.error("id", id.apply(bound), unique);
                }
                out.add(bound);
            }
        }
        return out;
    }
}
