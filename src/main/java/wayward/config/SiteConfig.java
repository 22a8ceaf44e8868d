package wayward.config;

import java.nio.file.Path;
import java.util.List;
import wayward.delivery.MqttConfig;
import wayward.delivery.WebhookConfig;
import wayward.analysis.CameraConfig;
import wayward.clip.ClipConfig;
import wayward.flow.FlowConfig;
import wayward.http.HttpConfig;

/**
 * A whole, checked configuration. Immutable; relative paths in the file are already resolved against the
 * config file's folder.
 *
 * @param file     the config file as the user named it (for messages)
 * @param dataDir  folder for the event log, the outbox and the evidence
 * @param flow     flow estimator settings shared by all cameras
 * @param cameras  at least one camera
 * @param webhooks zero or more webhook destinations
 * @param clips    evidence clip settings
 * @param mqtt     the MQTT broker, or null
 * @param outboxMaxBytes bound on the durable outbox's size on disk
 * @param http     the status server, or null when off
 * @param shard    this instance's share of the cameras, or null when one instance watches all
 * @param timeZone the site's time zone ([service] time_zone; zones' hours are in it), or null when not set
 * @param maxMute  the longest an operator's mute may last ({@code [service] max_mute_hours})
 */
public record SiteConfig(Path file, Path dataDir, FlowConfig flow, List<CameraConfig> cameras,
        List<WebhookConfig> webhooks, ClipConfig clips, MqttConfig mqtt, long outboxMaxBytes, HttpConfig http, ShardConfig shard,
        java.time.ZoneId timeZone, java.time.Duration maxMute) {
    /** The data folder, beside the config file, when {@code data_dir} is not given. */
    public static final String DEFAULT_DATA_DIR = "data";
    /** The outbox's bound on disk, MB ({@code [outbox] max_mb}). */
    public static final double DEFAULT_OUTBOX_MB = 256;
    /** The longest mute, hours ({@code [service] max_mute_hours}): a mute always ends by itself. */
    public static final double DEFAULT_MAX_MUTE_HOURS = 12;
    /** The bounds of {@code max_mute_hours}. */
    public static final double MIN_MAX_MUTE_HOURS = 0.1;
    public static final double MAX_MAX_MUTE_HOURS = 24 * 31;

    public SiteConfig {
        cameras = List.copyOf(cameras);
        webhooks = List.copyOf(webhooks);
    }

    /** The camera with this id, or null. */
    public CameraConfig camera(String id) {
        for (CameraConfig c : cameras) {
            if (c.id().equals(id)) {
                return c;
            }
        }
        return null;
    }
}
