package wayward.delivery;

import io.netty.bootstrap.Bootstrap;
import io.netty.channel.Channel;
import io.netty.channel.ChannelFuture;
import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.ChannelInitializer;
import io.netty.channel.ChannelOption;
import io.netty.channel.EventLoop;
import io.netty.channel.EventLoopGroup;
import io.netty.channel.MultiThreadIoEventLoopGroup;
import io.netty.channel.SimpleChannelInboundHandler;
import io.netty.channel.nio.NioIoHandler;
import io.netty.channel.socket.SocketChannel;
import io.netty.channel.socket.nio.NioSocketChannel;
import io.netty.handler.codec.mqtt.MqttConnAckMessage;
import io.netty.handler.codec.mqtt.MqttConnectReturnCode;
import io.netty.handler.codec.mqtt.MqttDecoder;
import io.netty.handler.codec.mqtt.MqttEncoder;
import io.netty.handler.codec.mqtt.MqttMessage;
import io.netty.handler.codec.mqtt.MqttMessageIdVariableHeader;
import io.netty.handler.codec.mqtt.MqttPublishMessage;
import io.netty.handler.codec.mqtt.MqttQoS;
import io.netty.handler.codec.mqtt.MqttSubAckMessage;
import io.netty.handler.ssl.SslContext;
import io.netty.handler.timeout.IdleState;
import io.netty.handler.timeout.IdleStateEvent;
import io.netty.handler.timeout.IdleStateHandler;
import io.netty.util.concurrent.DefaultThreadFactory;
import java.net.URI;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.retry.Backoff;
import wayward.secret.Urls;

/**
 * Publishes event phases to an MQTT broker, MQTT 3.1.1 (OASIS standard) through Netty's MQTT codec, over TCP
 * or TLS, to the {@link MqttTopics}. Every publish is QoS 1 and counts as delivered when its PUBACK arrives. The
 * session is kept (clean session 0); after a reconnect every unacknowledged publish is sent again with its
 * packet identifier and the DUP flag (MQTT 3.1.1 §4.4). Keep-alive pings when idle; reconnect with exponential
 * backoff and jitter; the will marks the service offline. All network work runs on one Netty event loop
 * thread; {@link #send} may be called from the courier thread.
 */
public final class MqttPublisher implements Destination {
    private static final Logger LOG = LoggerFactory.getLogger(MqttPublisher.class);

    private final MqttConfig config;
    private final String shownUrl;
    private final String host;
    private final int port;
    private final SslContext ssl;
    private final EventLoopGroup group;
    private final EventLoop loop;
    private final List<String> zones;
    private final long runStartSeq;
    private final String statusTopic;
    /** Open camera conditions; confined to the courier thread that calls {@link #send}. */
    private final CameraStates cameraStates = new CameraStates();
    /** Open alerts, mutes and off hours per zone; confined to the courier thread that calls {@link #send}. */
    private final ZoneStates zoneStates = new ZoneStates();
    /** Told of the other instances' statuses, or null when this instance watches alone. */
    private final PeerWatch peers;
    /** Told of operators' commands, or null when they are not read. */
    private final CommandWatch commands;
    /** Where mute records read below {@code <prefix>/mutes/} go; null: none read. Called on the event loop. */
    private final MuteRecords mutes;

    /**
     * Told of the mute records below {@code <prefix>/mutes/}, on the event loop, in this order on each connection:
     * {@link #subscribing}, the records the broker retained (and live ones), {@link #caughtUp} once every retained
     * record has been read, then live records.
     */
    public interface MuteRecords {
        void subscribing();

        void record(byte[] json);

        void caughtUp();
    }
    // packet identifiers of the SUBSCRIBEs in flight (event loop only)
    private int statusSubscription;
    private int commandSubscription;
    private int muteSubscription;
    /** PINGREQs sent and PINGRESPs read on this connection, and the answer that follows the retained mutes. */
    private long pingsSent;
    private long pingsAnswered;
    private long mutesCaughtUpAt = -1;

    // confined to the event loop thread
    private final MqttInFlight inFlight = new MqttInFlight();
    /** Zones ("camera/zone") that had a phase in this run; their retained state is already current. */
    private final java.util.Set<String> touchedThisRun = new java.util.HashSet<>();
    private Channel channel;
    private boolean connected;
    private boolean closing;
    private final Backoff backoff;
    private String lastProblem;
    private int failedAttempts;
    private boolean subscribed;
    /** With peers: the online status sent again once a keep-alive, so the others can tell it is fresh. */
    private java.util.concurrent.ScheduledFuture<?> refresh;

    /**
     * @param zones       every configured zone as "camera/zone"; once the outbox backlog is delivered, the state
     *                    of each zone without a phase in this run is set to clear (an alert left open by a
     *                    crashed earlier run does not stay retained forever)
     * @param runStartSeq the first outbox seq of this run (phases before it come from an earlier run)
     */
    public MqttPublisher(MqttConfig config, List<String> zones, long runStartSeq) {
        this(config, zones, runStartSeq, null);
    }

    /**
     * A publisher that also subscribes to every client's status below the prefix and tells {@code peers} of the
     * instances' (see {@link PeerWatch}); null peers: publish only.
     */
    public MqttPublisher(MqttConfig config, List<String> zones, long runStartSeq, PeerWatch peers) {
        this(config, zones, runStartSeq, peers, null);
    }

    /** ... and reads operators' commands below {@code <prefix>/command/} when {@code commands} is not null. */
    public MqttPublisher(MqttConfig config, List<String> zones, long runStartSeq, PeerWatch peers,
            CommandWatch commands) {
        this(config, zones, runStartSeq, peers, commands, null);
    }

    /**
     * ... and passes mutes between instances when {@code mutes} is not null: {@link #shareMute} publishes a record
     * retained below {@code <prefix>/mutes/}, and every record there (this instance's own too) goes to {@code mutes}.
     */
    public MqttPublisher(MqttConfig config, List<String> zones, long runStartSeq, PeerWatch peers,
            CommandWatch commands, MuteRecords mutes) {
        this.config = config;
        this.peers = peers;
        this.commands = commands;
        this.mutes = mutes;
        this.shownUrl = Urls.mask(config.url());
        URI uri = URI.create(config.url());
        boolean tls = "mqtts".equalsIgnoreCase(uri.getScheme());
        this.host = uri.getHost();
        this.port = uri.getPort() > 0 ? uri.getPort() : (tls ? 8883 : 1883);
        this.ssl = tls ? TlsTrust.clientContext(config.caFile(), shownUrl) : null;
        this.zones = List.copyOf(zones);
        this.runStartSeq = runStartSeq;
        this.statusTopic = MqttTopics.statusTopic(config.topicPrefix(), config.clientId());
        this.backoff = new Backoff(1000, (long) (config.maxBackoffSeconds() * 1000));
        this.group = new MultiThreadIoEventLoopGroup(1, new DefaultThreadFactory("mqtt", true),
                NioIoHandler.newFactory());
        this.loop = group.next();
        loop.execute(this::connect);
    }

    @Override
    public String name() {
        return "mqtt " + shownUrl;
    }

    @Override
    public String key() {
        return "mqtt-" + TlsTrust.shortHash(config.url() + " " + config.clientId());
    }

    @Override
    public int window() {
        return Math.max(1, config.inFlight());
    }

    @Override
    public CompletableFuture<Result> send(long seq, Event e) {
        byte[] body = EventJson.toJson(e).getBytes(StandardCharsets.UTF_8);
        String stateTopic = MqttTopics.stateTopic(config.topicPrefix(), e.camera(), e.zone());
        byte[] state = e.zone() != null ? zoneStates.apply(seq, e) : cameraStates.apply(seq, e);
        CompletableFuture<Result> done = new CompletableFuture<>();
        loop.execute(() -> {
            if (e.zone() != null && seq >= runStartSeq) {
                touchedThisRun.add(e.camera() + "/" + e.zone());
            }
            CompletableFuture<Void> a = publish(MqttTopics.eventTopic(config.topicPrefix(), e), body, false);
            CompletableFuture<Void> b = publish(stateTopic, state, true);
            CompletableFuture.allOf(a, b).whenComplete((v, x) -> done.complete(
                    x == null ? Result.DELIVERED : Result.retry(String.valueOf(x))));
        });
        return done;
    }

    @Override
    public void caughtUp() {
        loop.execute(() -> {
            for (String z : zones) {
                if (!touchedThisRun.contains(z)) {
                    int slash = z.indexOf('/');
                    publish(MqttTopics.stateTopic(config.topicPrefix(), z.substring(0, slash),
                            z.substring(slash + 1)), MqttTopics.clearPayload(), true);
                }
            }
        });
    }

    /** The client's status; offline is stamped only when sent on closing, not as the will. */
    private byte[] statusPayload(String state) {
        return MqttTopics.statusPayload(config.clientId(), config.instance(), state,
                !"offline".equals(state) || closing);
    }

    /**
     * Passes a mute record to the other instances: retained, QoS 1, sent now or once connected again (while this
     * process lives). Any thread.
     */
    public void shareMute(String camera, String zone, byte[] record) {
        loop.execute(() -> publish(MqttTopics.muteTopic(config.topicPrefix(), camera, zone), record, true));
    }

    /** Queues a QoS 1 publish and sends it now if connected. Event loop only. */
    private CompletableFuture<Void> publish(String topic, byte[] payload, boolean retain) {
        MqttInFlight.Outgoing o = new MqttInFlight.Outgoing(topic, payload, retain);
        int id = inFlight.add(o);
        if (connected) {
            write(id, o);
        }
        return o.acked;
    }

    private void write(int id, MqttInFlight.Outgoing o) {
        boolean dup = o.sent;
        o.sent = true;
        channel.writeAndFlush(MqttPackets.publish(id, o.topic, o.payload, o.retain, dup));
    }

    private void connect() {
        if (closing) {
            return;
        }
        Bootstrap b = new Bootstrap()
                .group(loop)
                .channel(NioSocketChannel.class)
                .option(ChannelOption.CONNECT_TIMEOUT_MILLIS, 10_000)
                .handler(new ChannelInitializer<SocketChannel>() {
                    @Override
                    protected void initChannel(SocketChannel ch) {
                        if (ssl != null) {
                            ch.pipeline().addLast(ssl.newHandler(ch.alloc(), host, port));
                        }
                        int keepAlive = config.keepAliveSeconds();
                        // a broker that says nothing for 1.5 keep-alive periods is gone (MQTT 3.1.1 §3.1.2.10)
                        ch.pipeline().addLast(new IdleStateHandler(keepAlive * 3 / 2, keepAlive, 0));
                        ch.pipeline().addLast(new MqttDecoder());
                        ch.pipeline().addLast(MqttEncoder.INSTANCE);
                        ch.pipeline().addLast(new Handler());
                    }
                });
        ChannelFuture f = b.connect(host, port);
        f.addListener(done -> {
            if (!done.isSuccess()) {
                problem(describe(done.cause()));
                scheduleReconnect();
            }
        });
    }

    private static String describe(Throwable t) {
        Throwable c = t;
        while (c.getCause() != null && c.getCause() != c) {
            c = c.getCause();
        }
        String m = c.getMessage() != null ? c.getMessage() : c.getClass().getSimpleName();
        return t == c ? m : (t.getMessage() != null ? t.getMessage() : m);
    }

    /** Logs a problem once while it lasts; a different problem is logged again. */
    private void problem(String what) {
        failedAttempts++;
        if (!what.equals(lastProblem)) {
            LOG.warn("{}: {}; {} publishes waiting, retrying with backoff up to {} s", name(), what,
                    inFlight.size(), (long) config.maxBackoffSeconds());
            lastProblem = what;
        } else {
            LOG.debug("{}: {} (attempt {})", name(), what, failedAttempts);
        }
    }

    private void scheduleReconnect() {
        if (closing) {
            return;
        }
        loop.schedule(this::connect, backoff.nextMillis(), TimeUnit.MILLISECONDS);
    }

    private final class Handler extends SimpleChannelInboundHandler<MqttMessage> {
        private String dropReason;

        @Override
        public void channelActive(ChannelHandlerContext ctx) {
            if (ctx.channel().localAddress().equals(ctx.channel().remoteAddress())) {
                // TCP can connect a socket to itself when nothing listens on a port of the ephemeral range
                dropReason = "nothing listens on " + host + ":" + port;
                ctx.close();
                return;
            }
            channel = ctx.channel();
            pingsSent = 0;
            pingsAnswered = 0;
            mutesCaughtUpAt = -1;
            ctx.writeAndFlush(MqttPackets.connect(config, statusTopic, statusPayload("offline")));
        }

        @Override
        protected void channelRead0(ChannelHandlerContext ctx, MqttMessage m) {
            if (m.decoderResult().isFailure()) {
                dropReason = "broker sent a malformed packet (" + m.decoderResult().cause() + ")";
                ctx.close();
                return;
            }
            switch (m.fixedHeader().messageType()) {
                case CONNACK -> connAck(ctx, (MqttConnAckMessage) m);
                case PUBACK -> inFlight.acknowledged(
                        ((MqttMessageIdVariableHeader) m.variableHeader()).messageId());
                case SUBACK -> subAck(ctx, (MqttSubAckMessage) m);
                case PUBLISH -> received(ctx, (MqttPublishMessage) m);
                case PINGRESP -> {
                    // the idle handler counts it as traffic
                    pingsAnswered++;
                    if (pingsAnswered == mutesCaughtUpAt) {
                        mutesCaughtUpAt = -1;
                        mutes.caughtUp();
                    }
                }
                default -> LOG.debug("{}: ignoring {}", name(), m.fixedHeader().messageType());
            }
        }

        private void connAck(ChannelHandlerContext ctx, MqttConnAckMessage m) {
            MqttConnectReturnCode code = m.variableHeader().connectReturnCode();
            if (code != MqttConnectReturnCode.CONNECTION_ACCEPTED) {
                dropReason = MqttPackets.refusal(code, config);
                ctx.close();
                return;
            }
            connected = true;
            if (failedAttempts > 0) {
                LOG.info("{}: connected again after {} failed attempts; sending {} unacknowledged publishes",
                        name(), failedAttempts, inFlight.size());
            } else {
                LOG.info("{}: connected as {} (session present: {})", name(), config.clientId(),
                        m.variableHeader().isSessionPresent());
            }
            failedAttempts = 0;
            lastProblem = null;
            backoff.reset();
            // everything still unacknowledged, in its order (DUP set on those sent before), then the status
            for (Map.Entry<Integer, MqttInFlight.Outgoing> en : inFlight.all()) {
                write(en.getKey(), en.getValue());
            }
            publish(statusTopic, statusPayload("online"), true);
            if (commands != null) {
                commandSubscription = inFlight.otherId();
                ctx.writeAndFlush(MqttPackets.subscribe(commandSubscription,
                        MqttTopics.commandFilter(config.topicPrefix()), MqttQoS.AT_LEAST_ONCE));
            }
            if (mutes != null) {
                muteSubscription = inFlight.otherId();
                mutes.subscribing();
                // QoS 0: the records are retained state, so one missed while the connection drops comes again
                // at the next subscription; and a broker sends retained QoS 0 messages at once, not held back
                // behind its in-flight window, so they all come before the answer to the ping after the SUBACK
                ctx.writeAndFlush(MqttPackets.subscribe(muteSubscription, MqttTopics.muteFilter(config.topicPrefix()),
                        MqttQoS.AT_MOST_ONCE));
            }
            if (peers != null) {
                statusSubscription = inFlight.otherId();
                ctx.writeAndFlush(MqttPackets.subscribe(statusSubscription,
                        MqttTopics.statusFilter(config.topicPrefix()), MqttQoS.AT_MOST_ONCE));
                int every = config.keepAliveSeconds();
                refresh = loop.scheduleWithFixedDelay(() -> {
                    if (connected && !closing) {
                        publish(statusTopic, statusPayload("online"), true);
                    }
                }, every, every, TimeUnit.SECONDS);
            }
        }

        private void subAck(ChannelHandlerContext ctx, MqttSubAckMessage m) {
            // MQTT 3.1.1 §3.9.3: 0x80 is a refusal (typically the broker's ACL)
            boolean refused = m.payload().grantedQoSLevels().stream().anyMatch(q -> q >= 0x80);
            int id = m.variableHeader().messageId();
            if (commands != null && id == commandSubscription) {
                if (refused) {
                    LOG.warn("{}: the broker refused the subscription to {} (check its ACL): operators' MQTT commands "
                            + "are not read", name(), MqttTopics.commandFilter(config.topicPrefix()));
                } else {
                    LOG.info("{}: reading operators' commands on {}", name(),
                            MqttTopics.commandFilter(config.topicPrefix()));
                }
                return;
            }
            if (mutes != null && id == muteSubscription) {
                if (refused) {
                    LOG.warn("{}: the broker refused the subscription to {} (check its ACL): mutes asked of another "
                            + "instance's status server are not known here", name(),
                            MqttTopics.muteFilter(config.topicPrefix()));
                } else {
                    // the broker sends the retained records right after the SUBACK, before it answers a later
                    // ping (it handles one client's packets in order): that answer says they have all been read
                    ping(ctx);
                    mutesCaughtUpAt = pingsSent;
                }
                return;
            }
            if (peers == null || id != statusSubscription) {
                return;
            }
            if (refused) {
                LOG.warn("{}: the broker refused the subscription to {} (check its ACL): the other instances "
                        + "cannot be seen, so this one keeps the cameras it watches", name(),
                        MqttTopics.statusFilter(config.topicPrefix()));
                return;
            }
            subscribed = true;
            peers.subscribed();
        }

        /** A command, or a status of some client: the instance it names is online or offline. */
        private void received(ChannelHandlerContext ctx, MqttPublishMessage m) {
            if (m.fixedHeader().qosLevel() == MqttQoS.AT_LEAST_ONCE) {
                ctx.writeAndFlush(MqttPackets.pubAck(m.variableHeader().packetId()));
            }
            byte[] body = new byte[m.payload().readableBytes()];
            m.payload().getBytes(m.payload().readerIndex(), body);
            String topic = m.variableHeader().topicName();
            String[] command = MqttTopics.command(config.topicPrefix(), topic);
            if (command != null) {
                if (commands != null) {
                    commands.command(command[0], command[1], body);
                }
                return;
            }
            if (MqttTopics.isMute(config.topicPrefix(), topic)) {
                if (mutes != null && body.length > 0) {
                    mutes.record(body);
                }
                return;
            }
            if (peers == null || !subscribed) {
                return;
            }
            MqttTopics.PeerStatus st = MqttTopics.parseStatus(body);
            if (st == null) {
                LOG.debug("{}: ignoring a status on {} that names no instance", name(), m.variableHeader().topicName());
            } else if (!st.instance().equals(config.instance())) {
                peers.status(st.instance(), st.online());
            }
        }

        private void ping(ChannelHandlerContext ctx) {
            pingsSent++;
            ctx.writeAndFlush(MqttPackets.pingReq());
        }

        @Override
        public void userEventTriggered(ChannelHandlerContext ctx, Object evt) throws Exception {
            if (evt instanceof IdleStateEvent idle) {
                if (idle.state() == IdleState.WRITER_IDLE) {
                    ping(ctx);
                } else if (idle.state() == IdleState.READER_IDLE) {
                    dropReason = "broker silent for " + config.keepAliveSeconds() * 3 / 2 + " s";
                    ctx.close();
                }
                return;
            }
            super.userEventTriggered(ctx, evt);
        }

        @Override
        public void exceptionCaught(ChannelHandlerContext ctx, Throwable cause) {
            if (dropReason == null) {
                dropReason = describe(cause);
            }
            ctx.close();
        }

        @Override
        public void channelInactive(ChannelHandlerContext ctx) {
            boolean was = connected;
            connected = false;
            channel = null;
            if (refresh != null) {
                refresh.cancel(false);
                refresh = null;
            }
            if (subscribed) {
                subscribed = false;
                peers.lost();
            }
            if (closing) {
                return;
            }
            String why = dropReason != null ? dropReason : "connection closed by the broker";
            problem(was ? "connection lost (" + why + ")" : why);
            scheduleReconnect();
        }
    }

    /**
     * Publishes the retained offline status, waits briefly for it, disconnects cleanly (so no will is sent)
     * and stops the event loop. Unacknowledged event phases stay in the outbox.
     */
    @Override
    public void close() {
        CompletableFuture<Void> done = new CompletableFuture<>();
        loop.execute(() -> {
            if (!connected) {
                closing = true;
                done.complete(null);
                return;
            }
            closing = true;
            publish(statusTopic, statusPayload("offline"), true).orTimeout(2, TimeUnit.SECONDS)
                    .whenComplete((v, x) -> loop.execute(() -> {
                        if (channel != null) {
                            Channel ch = channel;
                            ch.writeAndFlush(MqttPackets.disconnect()).addListener(f -> ch.close());
                        }
                        done.complete(null);
                    }));
        });
        try {
            done.get(4, TimeUnit.SECONDS);
        } catch (Exception e) {
            LOG.debug("{}: close: {}", name(), e.toString());
        }
        group.shutdownGracefully(0, 2, TimeUnit.SECONDS).awaitUninterruptibly(3000);
    }
}
