//! The interactive viewer: a window with the scene, orbit camera and panel, keys for the
//! pressure, the object and what is shown, reactive redraw, and scripted steps for tests
//! and measurements (`--script`, hidden).
//!
//! Redraw is reactive: the window is drawn again only after input or a change (an
//! hour's wait otherwise), so an idle viewer uses no CPU. The pressure windows of the
//! whole check (the sweep, seconds of work) are computed on a thread that wakes the
//! window when done. A script runs with continuous updates and returns to reactive
//! redraw when it ends.

use std::collections::VecDeque;
use std::f32::consts::TAU;
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use bevy::log::{Level, LogPlugin};
use bevy::prelude::*;
use bevy::render::RenderPlugin;
use bevy::render::view::Msaa;
use bevy::render::view::screenshot::{Screenshot, ScreenshotCaptured};
use bevy::window::WindowResolution;
use bevy::winit::{EventLoopProxyWrapper, UpdateMode, WinitSettings, WinitUserEvent};
use grasp_core::check::{CheckSettings, check_scene};

use super::camera::{Orbit, projection};
use super::framing::{self, View};
use super::model::{SweepOutcome, ViewState};
use super::scene::{Action, Model, SceneSystems};
use super::{ViewerPlugins, probe};
use crate::commands::view::ViewConfig;
use crate::error::{AppError, Outcome};

/// Extra wait of an idle step beyond its length.
const IDLE_MARGIN: Duration = Duration::from_millis(250);

/// Window size at start (pixels).
pub const WINDOW_SIZE: (u32, u32) = (1280, 720);

/// One scripted step.
#[derive(Debug, Clone, PartialEq)]
pub enum Step {
    /// An action, as from a key.
    Act(Action),
    /// `N` frames of one full turn about the target, frames/s on stderr.
    Orbit(u32),
    /// A screenshot of the window to this PNG file.
    Shot(String),
    /// Once the sweep is done, this many seconds with nothing to do under reactive
    /// redraw; the process's CPU time over them on stderr.
    Idle(u32),
    /// Close the viewer.
    Quit,
}

/// Parses `--script` steps.
///
/// # Errors
/// An unknown step, with its text.
pub fn parse_script(s: &str) -> Result<Vec<Step>, AppError> {
    s.split(',')
        .map(str::trim)
        .filter(|t| !t.is_empty())
        .map(|t| {
            Ok(match t {
                "up" => Step::Act(Action::Pressure(1)),
                "down" => Step::Act(Action::Pressure(-1)),
                "next" => Step::Act(Action::Object(1)),
                "prev" => Step::Act(Action::Object(-1)),
                "forces" => Step::Act(Action::ToggleForces),
                "fibers" => Step::Act(Action::ToggleFibers),
                "set" => Step::Act(Action::ToggleObjectSet),
                "shadows" => Step::Act(Action::ToggleShadows),
                "msaa" => Step::Act(Action::ToggleMsaa),
                "reset" => Step::Act(Action::ResetView),
                "quit" => Step::Quit,
                _ => {
                    if let Some(n) = t.strip_prefix("orbit:") {
                        let n: u32 =
                            n.parse().map_err(|_| AppError::input(format!("--script: bad step \"{t}\"")))?;
                        Step::Orbit(n.max(1))
                    } else if let Some(n) = t.strip_prefix("idle:") {
                        let n: u32 =
                            n.parse().map_err(|_| AppError::input(format!("--script: bad step \"{t}\"")))?;
                        Step::Idle(n.clamp(1, 600))
                    } else if let Some(path) = t.strip_prefix("shot:") {
                        Step::Shot(path.to_string())
                    } else {
                        return Err(AppError::input(format!("--script: unknown step \"{t}\"")));
                    }
                }
            })
        })
        .collect()
}

/// The script's progress.
#[derive(Resource)]
struct Script {
    steps: VecDeque<Step>,
    /// Frames left of an orbit, its start and its length.
    orbit: Option<(u32, Instant, u32)>,
    /// A screenshot is on its way.
    waiting: Arc<Mutex<bool>>,
    /// The last step changed the solved state: report its solve time next frame.
    report_solve: bool,
    /// First error, for the exit code.
    error: Arc<Mutex<Option<String>>>,
    /// Frames drawn before the script starts (the first frames set up pipelines).
    warmup: u32,
    /// The script has ended and redraw is reactive again.
    finished: bool,
    /// An idle step under way: its start, the process's CPU seconds then, its length.
    idle: Option<(Instant, Option<f64>, u32)>,
}

/// CPU seconds (user + system) of this process so far: fields 14 and 15 (`utime`,
/// `stime`, clock ticks) of `/proc/self/stat` (Linux; `None` elsewhere).
fn process_cpu_seconds() -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    let rest = &stat[stat.rfind(')')? + 2..];
    let fields: Vec<&str> = rest.split_whitespace().collect();
    let utime: f64 = fields.get(11)?.parse().ok()?;
    let stime: f64 = fields.get(12)?.parse().ok()?;
    // the kernel's USER_HZ is 100 on every Linux build in common use
    Some((utime + stime) / 100.0)
}

/// The pressure windows of the whole check, once the thread has them.
#[derive(Resource, Clone, Default)]
struct Sweep(Arc<Mutex<Option<SweepOutcome>>>);

/// Reactive redraw: only on input and window events (and wake-ups from the thread).
fn reactive() -> WinitSettings {
    reactive_for(Duration::from_secs(3600))
}

/// Reactive redraw that wakes up by itself after `wait`.
fn reactive_for(wait: Duration) -> WinitSettings {
    let mode = UpdateMode::Reactive {
        wait,
        react_to_device_events: false,
        react_to_user_events: true,
        react_to_window_events: true,
    };
    WinitSettings { focused_mode: mode, unfocused_mode: mode }
}

fn continuous() -> WinitSettings {
    WinitSettings { focused_mode: UpdateMode::Continuous, unfocused_mode: UpdateMode::Continuous }
}

/// Opens the viewer and returns when its window is closed.
///
/// # Errors
/// No Vulkan adapter or no display (exit 2, naming what is missing), a bad script, or a
/// failed scripted screenshot.
pub fn run(config: ViewConfig) -> Result<Outcome, AppError> {
    let steps = match &config.script {
        Some(s) => parse_script(s)?,
        None => Vec::new(),
    };
    if std::env::var_os("DISPLAY").is_none() {
        return Err(AppError::input(
            "no X display (DISPLAY is not set): run the viewer in a desktop session or under Xvfb \
             (apt-get install xvfb; Xvfb :99 & DISPLAY=:99 arcfinger view ...), or write pictures \
             with `arcfinger render`",
        ));
    }
    let adapter = probe::vulkan_adapter()?;
    eprintln!("arcfinger: rendering with {adapter}");
    let settings = CheckSettings { elements: config.elements, ..CheckSettings::default() };
    let state = ViewState::new(config.scene.clone(), settings, config.object, config.pressure);
    let (lo, hi) = state.bounds();
    let aspect = f64::from(WINDOW_SIZE.0) / f64::from(WINDOW_SIZE.1);
    let pose = framing::fit((lo * 1e3).to_array(), (hi * 1e3).to_array(), View::Iso, aspect);
    let error = Arc::new(Mutex::new(None));
    let scripted = !steps.is_empty();
    let title = format!("arcfinger: {}", config.scene.name);
    let mut app = App::new();
    app.add_plugins(
        DefaultPlugins
            .set(WindowPlugin {
                primary_window: Some(Window {
                    title,
                    resolution: WindowResolution::new(WINDOW_SIZE.0, WINDOW_SIZE.1),
                    ..default()
                }),
                ..default()
            })
            .set(LogPlugin { level: Level::WARN, filter: "wgpu=error,naga=warn".into(), ..default() })
            // the first frame waits for its shaders: a screenshot or a measurement right
            // after start sees the whole scene (CPU shader compiles take seconds)
            .set(RenderPlugin { synchronous_pipeline_compilation: true, ..default() }),
    )
    .add_plugins(ViewerPlugins { overlay: true })
    .insert_resource(Model(state))
    .insert_resource(if scripted { continuous() } else { reactive() })
    .insert_resource(Sweep::default())
    .insert_resource(Script {
        steps: steps.into(),
        orbit: None,
        waiting: Arc::new(Mutex::new(false)),
        report_solve: false,
        error: error.clone(),
        warmup: 3,
        finished: !scripted,
        idle: None,
    })
    .insert_resource(HomePose(pose))
    .add_systems(Startup, (spawn_camera, start_sweep))
    .add_systems(Update, (keys_to_actions, run_script, collect_sweep).before(SceneSystems::Apply));
    app.run();
    if let Some(e) = error.lock().map(|mut e| e.take()).unwrap_or(None) {
        return Err(AppError::input(e));
    }
    Ok(Outcome::Pass)
}

#[derive(Resource)]
struct HomePose(framing::CameraPose);

fn spawn_camera(mut commands: Commands, home: Res<HomePose>) {
    let orbit = Orbit::of_pose(&home.0);
    commands.spawn((Camera3d::default(), projection(), Msaa::Off, orbit, orbit.transform()));
}

/// Starts the sweep of the whole check on a thread; it wakes the window when done.
fn start_sweep(model: Res<Model>, sweep: Res<Sweep>, proxy: Res<EventLoopProxyWrapper>) {
    let scene = model.0.scene.clone();
    let settings = model.0.settings;
    let slot = sweep.0.clone();
    let proxy = (**proxy).clone();
    std::thread::spawn(move || {
        let result = check_scene(&scene, &settings)
            .map(|r| (r.objects.iter().map(|o| o.pressure_window).collect(), r.recommended_pressure))
            .map_err(|e| e.to_string());
        if let Ok(mut s) = slot.lock() {
            *s = Some(result);
        }
        let _ = proxy.send_event(WinitUserEvent::WakeUp);
    });
}

/// Hands the sweep's windows to the state when they arrive.
fn collect_sweep(sweep: Res<Sweep>, mut model: ResMut<Model>) {
    let done = sweep.0.try_lock().ok().and_then(|mut s| s.take());
    if let Some(result) = done {
        model.0.set_windows(result);
    }
}

/// Keys to actions; Escape or Q closes the viewer.
fn keys_to_actions(
    keys: Res<ButtonInput<KeyCode>>,
    mut actions: MessageWriter<Action>,
    mut exit: MessageWriter<AppExit>,
) {
    let map = [
        (KeyCode::ArrowUp, Action::Pressure(1)),
        (KeyCode::Equal, Action::Pressure(1)),
        (KeyCode::NumpadAdd, Action::Pressure(1)),
        (KeyCode::PageUp, Action::Pressure(4)),
        (KeyCode::ArrowDown, Action::Pressure(-1)),
        (KeyCode::Minus, Action::Pressure(-1)),
        (KeyCode::NumpadSubtract, Action::Pressure(-1)),
        (KeyCode::PageDown, Action::Pressure(-4)),
        (KeyCode::ArrowRight, Action::Object(1)),
        (KeyCode::Tab, Action::Object(1)),
        (KeyCode::ArrowLeft, Action::Object(-1)),
        (KeyCode::KeyF, Action::ToggleForces),
        (KeyCode::KeyW, Action::ToggleFibers),
        (KeyCode::KeyA, Action::ToggleObjectSet),
        (KeyCode::KeyS, Action::ToggleShadows),
        (KeyCode::KeyM, Action::ToggleMsaa),
        (KeyCode::KeyR, Action::ResetView),
    ];
    for (key, action) in map {
        if keys.just_pressed(key) {
            actions.write(action);
        }
    }
    if keys.just_pressed(KeyCode::Escape) || keys.just_pressed(KeyCode::KeyQ) {
        exit.write(AppExit::Success);
    }
}

/// Plays the script, one step per frame (an orbit over its frames, a screenshot until
/// it is written).
fn run_script(
    mut commands: Commands,
    mut script: ResMut<Script>,
    model: Res<Model>,
    mut orbits: Query<&mut Orbit>,
    mut actions: MessageWriter<Action>,
    mut exit: MessageWriter<AppExit>,
    mut winit: ResMut<WinitSettings>,
) {
    if script.finished {
        return;
    }
    if script.warmup > 0 {
        script.warmup -= 1;
        return;
    }
    if script.report_solve {
        let m = &model.0;
        eprintln!(
            "arcfinger: solved \"{}\" at {:.1} kPa in {:.1} ms",
            m.scene.objects[m.object].name,
            m.pressure * 1e-3,
            m.solve_time.as_secs_f64() * 1e3
        );
        script.report_solve = false;
    }
    if script.waiting.lock().map(|w| *w).unwrap_or(false) {
        return;
    }
    if let Some((start, cpu0, secs)) = script.idle {
        if start.elapsed() < Duration::from_secs(u64::from(secs)) {
            // woken early (a window event): keep waiting; the mode stays as it is, since
            // a change of mode makes bevy draw a frame at once
            return;
        }
        let wall = start.elapsed().as_secs_f64();
        match (cpu0, process_cpu_seconds()) {
            (Some(a), Some(b)) => eprintln!(
                "arcfinger: idle {wall:.1} s: {:.2} s CPU ({:.2} % of one core)",
                b - a,
                100.0 * (b - a) / wall
            ),
            _ => eprintln!("arcfinger: idle {wall:.1} s: CPU time unknown on this system"),
        }
        script.idle = None;
        *winit = continuous();
        return;
    }
    if let Some((left, start, n)) = script.orbit {
        for mut o in &mut orbits {
            o.yaw += TAU / n as f32;
        }
        if left > 1 {
            script.orbit = Some((left - 1, start, n));
        } else {
            let t = start.elapsed().as_secs_f64();
            eprintln!("arcfinger: orbit of {n} frames in {t:.2} s: {:.1} frames/s", f64::from(n) / t);
            script.orbit = None;
        }
        return;
    }
    let Some(step) = script.steps.pop_front() else {
        *winit = reactive();
        script.finished = true;
        return;
    };
    match step {
        Step::Act(a) => {
            script.report_solve = matches!(a, Action::Pressure(_) | Action::Object(_));
            actions.write(a);
        }
        Step::Orbit(n) => script.orbit = Some((n, Instant::now(), n)),
        Step::Idle(secs) => {
            if model.0.windows.is_none() {
                // the sweep still runs: its CPU is not the viewer's idle cost
                script.steps.push_front(Step::Idle(secs));
                return;
            }
            script.idle = Some((Instant::now(), process_cpu_seconds(), secs));
            // bevy counts the wait from the start of this frame, a little before `now`:
            // the margin puts the wake-up after the step's end, not just before it (which
            // made the step last two waits)
            *winit = reactive_for(Duration::from_secs(u64::from(secs)) + IDLE_MARGIN);
        }
        Step::Shot(path) => {
            if let Ok(mut w) = script.waiting.lock() {
                *w = true;
            }
            let waiting = script.waiting.clone();
            let error = script.error.clone();
            commands.spawn(Screenshot::primary_window()).observe(move |shot: On<ScreenshotCaptured>| {
                let result = super::offscreen::encode_png(&shot.image)
                    .map_err(AppError::input)
                    .and_then(|png| crate::output::write_atomic(std::path::Path::new(&path), &png));
                match result {
                    Ok(()) => eprintln!("arcfinger: wrote {path}"),
                    Err(e) => {
                        if let Ok(mut slot) = error.lock() {
                            slot.get_or_insert(e.to_string());
                        }
                    }
                }
                if let Ok(mut w) = waiting.lock() {
                    *w = false;
                }
            });
        }
        Step::Quit => {
            exit.write(AppExit::Success);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scripts_parse_and_refuse_unknown_steps() {
        let s = parse_script("up, down,next,orbit:90,shot:a.png,quit,idle:5").unwrap();
        assert_eq!(s[6], Step::Idle(5));
        assert_eq!(s[0], Step::Act(Action::Pressure(1)));
        assert_eq!(s[3], Step::Orbit(90));
        assert_eq!(s[4], Step::Shot("a.png".into()));
        assert_eq!(s[5], Step::Quit);
        assert!(parse_script("jump").is_err());
        assert!(parse_script("orbit:x").is_err());
    }
}
