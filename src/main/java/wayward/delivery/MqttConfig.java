package wayward.delivery;

import wayward.secret.Urls;

/**
 * The {@code [mqtt]} table: one broker that receives every event phase.
 *
 * @param url               mqtt://host[:port] (TCP, 1883) or mqtts://host[:port] (TLS, 8883)
 * @param topicPrefix       first topic level(s), e.g. "wayward" or "yard/north"
 * @param clientId          MQTT client identifier (also names the status topic)
 * @param username          login name, or null for an anonymous connection
 * @param passwordFile      file holding the password, or null
 * @param password          the password's bytes (never logged or printed), or null
 * @param keepAliveSeconds  MQTT keep-alive; a ping is sent when nothing else was
 * @param caFile            PEM file of extra certificate authorities for mqtts, besides the JDK's, or null
 * @param inFlight          event phases published and not yet acknowledged at most
 * @param maxBackoffSeconds longest wait between reconnect attempts
 * @param instance          this instance's name when several share the config (its status then says so), or null
 * @param commands          read operators' mute and unmute commands below {@code <prefix>/command/} (only with a
 *                          broker whose ACL lets each operator write only below its own name)
 */
public record MqttConfig(String url, String topicPrefix, String clientId, String username, String passwordFile,
        byte[] password, int keepAliveSeconds, String caFile, int inFlight, double maxBackoffSeconds,
        String instance, boolean commands) {
    public static final String DEFAULT_TOPIC_PREFIX = "wayward";
    /**
     * MQTT keep-alive. The broker fires the will of a client silent for 1.5 of it (MQTT 3.1.1 §3.1.2.10), so with
     * instances sharing the cameras a host that died loses them for 9 s plus a camera's start.
     */
    public static final int DEFAULT_KEEP_ALIVE_SECONDS = 6;
    /** Publishes sent and not yet acknowledged at most ({@code in_flight}). */
    public static final int DEFAULT_IN_FLIGHT = 16;
    /** Longest wait between reconnect attempts ({@code max_backoff_seconds}). */
    public static final double DEFAULT_MAX_BACKOFF_SECONDS = 30;


    /** Defaults for everything but the broker address (tests). */
    public static MqttConfig of(String url, String topicPrefix, String clientId) {
        return new MqttConfig(url, topicPrefix, clientId, null, null, null, DEFAULT_KEEP_ALIVE_SECONDS, null, 16, 30,
                null, false);
    }

    /** The same settings with a login. */
    public MqttConfig withLogin(String user, byte[] secret) {
        return new MqttConfig(url, topicPrefix, clientId, user, passwordFile, secret, keepAliveSeconds, caFile,
                inFlight, maxBackoffSeconds, instance, commands);
    }

    /** The same settings trusting the CA certificates in {@code file}. */
    public MqttConfig withCaFile(String file) {
        return new MqttConfig(url, topicPrefix, clientId, username, passwordFile, password, keepAliveSeconds, file,
                inFlight, maxBackoffSeconds, instance, commands);
    }

    @Override
    public String toString() {
        return "MqttConfig[url=" + Urls.mask(url) + ", clientId=" + clientId + ", username=" + username
                + "]";
    }
}
