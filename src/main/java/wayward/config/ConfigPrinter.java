package wayward.config;

import java.net.URI;
import java.net.URISyntaxException;
import wayward.delivery.MqttConfig;
import wayward.delivery.WebhookConfig;
import wayward.secret.Urls;
import wayward.analysis.CameraConfig;
import wayward.analysis.ZoneConfig;

/**
 * Prints the effective configuration (every key, defaults filled in; every key a zone of its kind takes, a key
 * left unset named in a comment) as TOML, with secrets masked: passwords in URLs and webhook query strings never
 * appear. Stateless.
 */
public final class ConfigPrinter {
    private ConfigPrinter() {
    }

    public static String toToml(SiteConfig c) {
        StringBuilder b = new StringBuilder();
        b.append("# effective configuration of ").append(c.file()).append(" (defaults filled in, secrets masked)\n");
        b.append("[service]\n");
        b.append("data_dir = ").append(quote(c.dataDir().toString())).append('\n');
        b.append("http = ").append(quote(c.http() == null ? "off" : c.http().host() + ":" + c.http().port())).append('\n');
        if (c.http() != null) {
            b.append("http_max_connections = ").append(c.http().maxConnections()).append('\n');
        }
        if (c.http() != null && c.http().tokenFile() != null) {
            b.append("token_file = ").append(quote(c.http().tokenFile())).append("   # the token itself is never printed\n");
        }
        b.append("max_mute_hours = ").append(num(c.maxMute().toSeconds() / 3600.0)).append('\n');
        if (c.shard() != null) {
            b.append("instance = ").append(quote(c.shard().instance())).append('\n');
            b.append("instances = [");
            for (int i = 0; i < c.shard().instances().size(); i++) {
                b.append(i == 0 ? "" : ", ").append(quote(c.shard().instances().get(i)));
            }
            b.append("]\n");
            b.append("membership = ").append(quote(c.shard().membership())).append('\n');
        }
        if (c.timeZone() != null) {
            b.append("time_zone = ").append(quote(c.timeZone().getId())).append('\n');
        } else {
            b.append("# time_zone not set: no zone has hours\n");
        }
        b.append("\n[flow]\n");
        b.append("levels = ").append(c.flow().levels()).append('\n');
        b.append("iterations = ").append(c.flow().iterations()).append('\n');
        b.append("finest_iterations = ").append(c.flow().finestIterations()).append('\n');
        b.append("window = ").append(c.flow().window()).append('\n');
        b.append("regularization = ").append(num(c.flow().regularization())).append('\n');
        b.append("stride = ").append(c.flow().stride()).append('\n');
        b.append("coarse_stride = ").append(c.flow().coarseStride()).append('\n');
        b.append("threads = ").append(c.flow().threads()).append('\n');
        b.append("skip_still = ").append(c.flow().skipStill()).append('\n');
        b.append("\n[clips]\n");
        b.append("enabled = ").append(c.clips().enabled()).append('\n');
        b.append("pre_roll_seconds = ").append(num(c.clips().preRollSeconds())).append('\n');
        b.append("post_roll_seconds = ").append(num(c.clips().postRollSeconds())).append('\n');
        b.append("max_seconds = ").append(num(c.clips().maxSeconds())).append('\n');
        b.append("keep_days = ").append(num(c.clips().keepDays())).append('\n');
        b.append("keep_gb = ").append(num(c.clips().keepGigabytes())).append('\n');
        for (CameraConfig cam : c.cameras()) {
            camera(b, cam, true);
        }
        for (WebhookConfig w : c.webhooks()) {
            b.append("\n[[webhook]]\n");
            b.append("url = ").append(quote(Urls.mask(w.url()))).append('\n');
            b.append("timeout_seconds = ").append(num(w.timeoutSeconds())).append('\n');
            b.append("max_backoff_seconds = ").append(num(w.maxBackoffSeconds())).append('\n');
            if (!w.headers().isEmpty()) {
                b.append("headers = { ");
                int n = 0;
                for (String h : w.headers().keySet()) {
                    b.append(n++ == 0 ? "" : ", ").append(quote(h)).append(" = \"***\"");
                }
                b.append(" }   # values are not printed\n");
            }
            if (w.caFile() != null) {
                b.append("ca_file = ").append(quote(w.caFile())).append('\n');
            }
            if (w.secretFile() != null) {
                b.append("secret_file = ").append(quote(w.secretFile())).append("   # the secret itself is never printed\n");
            }
        }
        MqttConfig m = c.mqtt();
        if (m != null) {
            b.append("\n[mqtt]\n");
            b.append("url = ").append(quote(Urls.mask(m.url()))).append('\n');
            b.append("topic_prefix = ").append(quote(m.topicPrefix())).append('\n');
            b.append("client_id = ").append(quote(m.clientId())).append('\n');
            if (m.username() != null) {
                b.append("username = ").append(quote(m.username())).append('\n');
            }
            if (m.passwordFile() != null) {
                b.append("password_file = ").append(quote(m.passwordFile())).append("   # the password itself is never printed\n");
            }
            b.append("keep_alive_seconds = ").append(m.keepAliveSeconds()).append('\n');
            if (m.caFile() != null) {
                b.append("ca_file = ").append(quote(m.caFile())).append('\n');
            }
            b.append("in_flight = ").append(m.inFlight()).append('\n');
            b.append("max_backoff_seconds = ").append(num(m.maxBackoffSeconds())).append('\n');
            b.append("commands = ").append(m.commands()).append('\n');
        }
        b.append("\n[outbox]\nmax_mb = ").append(num(c.outboxMaxBytes() / (double) (1 << 20))).append('\n');
        return b.toString();
    }

    /**
     * The camera's settings in full, secrets included: only for telling whether a camera changed on reload;
     * never to be logged or printed.
     */
    public static String cameraIdentity(CameraConfig cam) {
        StringBuilder b = new StringBuilder();
        camera(b, cam, false);
        return b.toString();
    }

    private static void camera(StringBuilder b, CameraConfig cam, boolean masked) {
        b.append("\n[[camera]]\n");
        b.append("id = ").append(quote(cam.id())).append('\n');
        b.append("source = ").append(quote(masked ? Urls.mask(cam.source()) : cam.source())).append('\n');
        if (cam.analysisSource() != null) {
            b.append("analysis_source = ").append(quote(masked ? Urls.mask(cam.analysisSource())
                    : cam.analysisSource())).append('\n');
        }
        b.append("loop = ").append(cam.loop()).append('\n');
        b.append("analysis_width = ").append(cam.analysisWidth()).append('\n');
        b.append("analysis_fps = ").append(num(cam.analysisFps())).append('\n');
        b.append("remove_camera_motion = ").append(cam.removeCameraMotion()).append('\n');
        b.append("tamper_alerts = ").append(cam.tamperAlerts()).append('\n');
        b.append("rtsp_transport = ").append(quote(cam.input().rtspTransport())).append('\n');
        b.append("lost_after_seconds = ").append(num(cam.input().lostAfterSeconds())).append('\n');
        if (cam.input().deviceSize() != null) {
            b.append("device_size = ").append(quote(cam.input().deviceSize())).append('\n');
        }
        if (cam.input().deviceFps() > 0) {
            b.append("device_fps = ").append(num(cam.input().deviceFps())).append('\n');
        }
        if (cam.input().deviceFormat() != null) {
            b.append("device_format = ").append(quote(cam.input().deviceFormat())).append('\n');
        }
        for (ZoneConfig z : cam.zones()) {
            b.append("\n  [[camera.zone]]\n");
            b.append("  id = ").append(quote(z.id())).append('\n');
            b.append("  polygon = [");
            double[] xs = z.xs();
            double[] ys = z.ys();
            for (int i = 0; i < xs.length; i++) {
                b.append(i == 0 ? "" : ", ").append('[').append(num(xs[i])).append(", ").append(num(ys[i])).append(']');
            }
            b.append("]\n");
            // every key a zone of its kind takes, with its value; a key left unset is named in a comment
            if (z.hasHeading()) {
                b.append("  heading_deg = ").append(num(z.headingDeg())).append('\n');
                b.append("  learn_heading_seconds = 0   # no learning: the heading is set\n");
            } else if (z.learnsHeading()) {
                b.append("  # heading_deg not set: learned from traffic\n");
                b.append("  learn_heading_seconds = ").append(num(z.learnHeadingSeconds()))
                        .append("   # the heading is learned from traffic and kept in data_dir/learned\n");
            } else {
                b.append("  # heading_deg not set: the zone reports any motion\n");
                b.append("  learn_heading_seconds = 0   # no learning: a motion zone\n");
            }
            b.append("  tolerance_deg = ").append(num(z.toleranceDeg())).append('\n');
            b.append("  min_speed = ").append(num(z.minSpeedPxPerSecond())).append('\n');
            b.append("  min_confidence = ").append(num(z.minConfidence())).append('\n');
            if (z.decidesOnMovers()) {
                b.append("  # decides on movers: one mover's travel against the heading starts an event\n");
                b.append("  min_mover_area_px = ").append(num(z.movers().minMoverAreaPx())).append('\n');
                b.append("  min_travel_px = ").append(num(z.movers().minTravelPx())).append('\n');
                b.append("  quick_travel_px = ").append(num(z.movers().quickTravelPx())).append('\n');
                b.append("  hold_seconds = ").append(num(z.movers().holdSeconds())).append('\n');
                b.append("  clear_seconds = ").append(num(z.movers().clearSeconds())).append('\n');
                b.append("  rest_seconds = ").append(num(z.movers().restSeconds())).append('\n');
            } else {
                b.append("  onset_level = ").append(num(z.rule().onsetLevel())).append('\n');
                b.append("  release_level = ").append(num(z.rule().releaseLevel())).append('\n');
                b.append("  hold_seconds = ").append(num(z.rule().holdSeconds())).append('\n');
                b.append("  clear_seconds = ").append(num(z.rule().clearSeconds())).append('\n');
                b.append("  rest_seconds = ").append(num(z.rule().restSeconds())).append('\n');
            }
            hours(b, z);
        }
    }

    private static void hours(StringBuilder b, ZoneConfig z) {
        if (!z.hasHours()) {
            b.append("  # hours not set: the zone raises events at every hour\n");
            b.append("  # off_dates not set: no hours to make exceptions to\n");
            return;
        }
        b.append("  hours = [");
        java.util.List<wayward.analysis.ZoneHours.Range> ranges = z.hours().ranges();
        for (int i = 0; i < ranges.size(); i++) {
            b.append(i == 0 ? "" : ", ").append(quote(ranges.get(i).text()));
        }
        // the time zone is named here too, so that a camera whose zones' time zone changed counts as changed
        b.append("]   # local times in ").append(z.hours().timeZone().getId()).append('\n');
        // spaced inside the brackets: tomlj 1.1.1 misreads a date right before "]" (TomlShape)
        b.append("  off_dates = [");
        java.util.List<java.time.LocalDate> dates = z.hours().offDates();
        for (int i = 0; i < dates.size(); i++) {
            b.append(i == 0 ? " " : ", ").append(dates.get(i));
        }
        b.append(dates.isEmpty() ? "]\n" : " ]\n");
    }

    private static String num(double d) {
        return TomlText.format(d);
    }

    private static String quote(String s) {
        return TomlText.render(s);
    }
}
