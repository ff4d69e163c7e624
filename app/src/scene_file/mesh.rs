//! Mesh objects of a scene: `Mesh(path: "meshes/part.stl", scale: 1.0)`.
//!
//! The path is relative to the scene file's folder and must stay inside it: scene files
//! arrive in pull requests and are checked in CI, so a scene must not be able to make
//! the tool read `/etc/passwd` or `../../secrets`. Absolute paths, `..` components and
//! backslashes are refused before any file is touched, and the resolved file (after
//! symbolic links) must still lie under the scene's folder. Only regular files up to
//! [`MAX_FILE_BYTES`] are read.
//!
//! A scene built into the binary (the bundled demo) reads its meshes from an in-memory
//! table instead ([`MeshSource::Embedded`]); the path is checked by the same rules and
//! the bytes go through the same parsing and checks as a file's.
//!
//! Formats by extension: `.stl` (binary or ASCII, through `stl_io`) and `.obj` (through
//! `tobj`, polygons triangulated as fans; `mtllib` references are not followed).
//! Coordinates are millimetres times `scale`, converted to metres; the file's origin is
//! the object's frame origin (the object's `position_mm`), so the mesh is not re-centred.

use std::io::Cursor;
use std::path::{Component, Path, PathBuf};

use grasp_core::math::Vec3;
use grasp_core::scene::TriangleMesh;

/// The most triangles a mesh may have (contact queries and enclosure casts stay fast).
pub const MAX_TRIANGLES: usize = 200_000;

/// The largest mesh file read (bytes): an ASCII STL of [`MAX_TRIANGLES`] triangles is
/// about 60 MB.
pub const MAX_FILE_BYTES: u64 = 128 * 1024 * 1024;

/// The largest extent a mesh may have after scaling (m), the same bound as any other
/// dimension of a scene.
pub const MAX_EXTENT_M: f64 = 10.0;

/// Where the mesh files of a scene come from.
#[derive(Debug, Clone, Copy)]
pub enum MeshSource<'a> {
    /// Files relative to the scene file's folder (and confined to it).
    Folder(&'a Path),
    /// Files relative to the scene file's folder, or absolute, or reached through `..`
    /// or a symbolic link: only when the user asked for it on the command line
    /// (`--allow-outside-meshes`). The other checks (regular file, size, contents) stay.
    Anywhere(&'a Path),
    /// An in-memory table of `(path as written in the scene, bytes)`, for a scene built
    /// into the binary. Paths are compared after dropping `.` components.
    Embedded(&'a [(&'a str, &'a [u8])]),
}

/// Reads and checks the mesh `rel` (as written in the scene) relative to `scene_dir`,
/// scaled by `scale` and converted from mm to m.
///
/// # Errors
/// A message that starts with the path as written: refused paths, unreadable files,
/// unknown extensions, files that do not parse, no triangles, non-finite coordinates,
/// out-of-range indices, only zero-area triangles, too many triangles, too large.
#[cfg(test)]
pub fn load_mesh(scene_dir: &Path, rel: &str, scale: f64) -> Result<TriangleMesh, String> {
    load_mesh_from(MeshSource::Folder(scene_dir), rel, scale)
}

/// Reads and checks the mesh `rel` (as written in the scene) from `source`, scaled by
/// `scale` and converted from mm to m.
///
/// # Errors
/// A message that starts with the path as written: refused paths, unreadable files or
/// (embedded) a path not in the table, unknown extensions, files that do not parse, no
/// triangles, non-finite coordinates, out-of-range indices, only zero-area triangles,
/// too many triangles, too large.
pub fn load_mesh_from(source: MeshSource<'_>, rel: &str, scale: f64) -> Result<TriangleMesh, String> {
    let at = |msg: String| format!("\"{rel}\": {msg}");
    // The same path rules for both sources: a scene must not depend on where it is read from.
    let confined = !matches!(source, MeshSource::Anywhere(_));
    let file = resolve(Path::new(""), rel, confined).map_err(at)?;
    let ext = file.extension().and_then(|e| e.to_str()).map(str::to_ascii_lowercase);
    let format = match ext.as_deref() {
        Some("stl") => Format::Stl,
        Some("obj") => Format::Obj,
        Some(other) => {
            return Err(at(format!("unknown mesh format `.{other}`: expected a .stl or .obj file")));
        }
        None => return Err(at("has no file extension: expected a .stl or .obj file".to_string())),
    };
    let bytes = match source {
        MeshSource::Folder(scene_dir) => read_inside(scene_dir, &scene_dir.join(&file)).map_err(at)?,
        MeshSource::Anywhere(scene_dir) => {
            let path = scene_dir.join(&file);
            read_regular(&path, &path.display().to_string()).map_err(at)?
        }
        MeshSource::Embedded(table) => embedded(table, &file).map_err(at)?.to_vec(),
    };
    let (vertices_mm, triangles) = match format {
        Format::Stl => parse_stl(&bytes),
        Format::Obj => parse_obj(&bytes),
    }
    .map_err(at)?;
    finish(vertices_mm, triangles, scale).map_err(at)
}

#[derive(Debug, Clone, Copy)]
enum Format {
    Stl,
    Obj,
}

/// Checks the path as written and joins it to the scene's folder; `confined` refuses
/// absolute paths and `..`.
fn resolve(scene_dir: &Path, rel: &str, confined: bool) -> Result<PathBuf, String> {
    if rel.trim().is_empty() {
        return Err("the path is empty: give a file relative to the scene file's folder".to_string());
    }
    if rel.contains('\\') {
        return Err(
            "use `/` to separate folders (a backslash is refused so scenes work everywhere)".to_string()
        );
    }
    let p = Path::new(rel);
    if !confined {
        return Ok(scene_dir.join(p));
    }
    // `C:` style prefixes are only recognised on Windows; refuse them everywhere.
    let drive = rel.len() >= 2 && rel.as_bytes()[1] == b':' && rel.as_bytes()[0].is_ascii_alphabetic();
    if p.is_absolute() || rel.starts_with('/') || drive {
        return Err(
            "absolute paths are refused: give the path relative to the scene file's folder".to_string()
        );
    }
    if p.components().any(|c| matches!(c, Component::ParentDir)) {
        return Err("`..` is refused: mesh files must lie in the scene file's folder or below it".to_string());
    }
    Ok(scene_dir.join(p))
}

/// Looks `file` (already checked by [`resolve`]) up in an embedded table.
fn embedded<'a>(table: &[(&str, &'a [u8])], file: &Path) -> Result<&'a [u8], String> {
    let normal =
        |p: &Path| -> PathBuf { p.components().filter(|c| !matches!(c, Component::CurDir)).collect() };
    let want = normal(file);
    match table.iter().find(|(name, _)| normal(Path::new(name)) == want) {
        Some((_, bytes)) if bytes.len() as u64 > MAX_FILE_BYTES => Err(format!(
            "{} is {} bytes; mesh files of at most {MAX_FILE_BYTES} bytes are read",
            file.display(),
            bytes.len()
        )),
        Some((_, bytes)) => Ok(bytes),
        None => {
            let names: Vec<&str> = table.iter().map(|(n, _)| *n).collect();
            Err(format!(
                "is not one of the files built into arcfinger with this scene ({})",
                if names.is_empty() { "none".to_string() } else { names.join(", ") }
            ))
        }
    }
}

/// Reads `file` after checking that it resolves to a regular file under `scene_dir`.
fn read_inside(scene_dir: &Path, file: &Path) -> Result<Vec<u8>, String> {
    let shown = file.display();
    let real = std::fs::canonicalize(file).map_err(|e| format!("cannot read {shown}: {e}"))?;
    let real_dir =
        std::fs::canonicalize(scene_dir).map_err(|e| format!("cannot resolve the scene's folder: {e}"))?;
    if !real.starts_with(&real_dir) {
        return Err(format!(
            "{shown} resolves to {} outside the scene file's folder (through a symbolic link); refused",
            real.display()
        ));
    }
    read_regular(&real, &shown.to_string())
}

/// Reads `file` (named `shown` in messages) if it is a regular file of at most
/// [`MAX_FILE_BYTES`].
fn read_regular(file: &Path, shown: &str) -> Result<Vec<u8>, String> {
    let meta = std::fs::metadata(file).map_err(|e| format!("cannot read {shown}: {e}"))?;
    if !meta.is_file() {
        return Err(format!("{shown} is not a regular file"));
    }
    if meta.len() > MAX_FILE_BYTES {
        return Err(format!(
            "{shown} is {} bytes; mesh files of at most {MAX_FILE_BYTES} bytes are read",
            meta.len()
        ));
    }
    std::fs::read(file).map_err(|e| format!("cannot read {shown}: {e}"))
}

type Parsed = (Vec<[f64; 3]>, Vec<[usize; 3]>);

/// Binary or ASCII STL. Vertices are merged by exact coordinates.
fn parse_stl(bytes: &[u8]) -> Result<Parsed, String> {
    let mut data = std::borrow::Cow::Borrowed(bytes);
    let declared =
        (bytes.len() >= 84).then(|| u32::from_le_bytes([bytes[80], bytes[81], bytes[82], bytes[83]]));
    let binary_size = declared.map(|n| 84 + 50 * n as u64);
    let says_solid = bytes.starts_with(b"solid");
    if says_solid && binary_size == Some(bytes.len() as u64) {
        // A binary file whose free-form header starts with "solid": its size matches
        // the binary layout exactly, so hide the word from the ASCII probe.
        let mut owned = bytes.to_vec();
        owned[..5].copy_from_slice(b"SOLID");
        data = owned.into();
    } else if says_solid && matches!(bytes.get(5), Some(b'\n' | b'\r')) {
        // ASCII with an unnamed solid: the reader wants "solid " and a name.
        let mut owned = b"solid unnamed".to_vec();
        owned.extend_from_slice(&bytes[5..]);
        data = owned.into();
    } else if !says_solid {
        match (declared, binary_size) {
            (None, _) => {
                return Err(format!(
                    "is not an STL file: {} bytes, shorter than a binary STL header",
                    bytes.len()
                ));
            }
            (Some(n), _) if n as usize > MAX_TRIANGLES => return Err(too_many(Some(n as usize))),
            (Some(n), Some(size)) if size > bytes.len() as u64 => {
                return Err(format!(
                    "binary STL is truncated: its header declares {n} triangles ({size} bytes), the file has {} bytes",
                    bytes.len()
                ));
            }
            _ => {}
        }
    }
    let mut cursor = Cursor::new(data.as_ref());
    let reader =
        stl_io::create_stl_reader(&mut cursor).map_err(|e| format!("is not a valid STL file: {e}"))?;
    let mut vertices: Vec<[f64; 3]> = Vec::new();
    let mut index_of = std::collections::HashMap::<[u32; 3], usize>::new();
    let mut triangles = Vec::new();
    for (i, t) in reader.enumerate() {
        let t = t.map_err(|e| format!("is not a valid STL file (triangle {}): {e}", i + 1))?;
        if triangles.len() == MAX_TRIANGLES {
            return Err(too_many(None));
        }
        let mut tri = [0usize; 3];
        for (k, v) in t.vertices.iter().enumerate() {
            let key = v.0.map(f32::to_bits);
            tri[k] = *index_of.entry(key).or_insert_with(|| {
                vertices.push(v.0.map(f64::from));
                vertices.len() - 1
            });
        }
        triangles.push(tri);
    }
    Ok((vertices, triangles))
}

/// OBJ, all objects and groups of the file, polygons triangulated.
fn parse_obj(bytes: &[u8]) -> Result<Parsed, String> {
    let options = tobj::LoadOptions {
        triangulate: true,
        ignore_points: true,
        ignore_lines: true,
        ..Default::default()
    };
    let mut reader = std::io::BufReader::new(Cursor::new(bytes));
    // Material libraries are never opened: a mesh file may not point at other files.
    let (models, _materials) =
        tobj::load_obj_buf(&mut reader, &options, |_| Err(tobj::LoadError::OpenFileFailed))
            .map_err(|e| format!("is not a valid OBJ file: {e}"))?;
    let mut vertices: Vec<[f64; 3]> = Vec::new();
    let mut triangles = Vec::new();
    for m in &models {
        let mesh = &m.mesh;
        if mesh.positions.len() % 3 != 0 || mesh.indices.len() % 3 != 0 {
            return Err(format!(
                "is not a valid OBJ file: object \"{}\" has incomplete vertices or faces",
                m.name
            ));
        }
        let offset = vertices.len();
        let n = mesh.positions.len() / 3;
        vertices.extend(mesh.positions.chunks_exact(3).map(|c| [c[0], c[1], c[2]]));
        for f in mesh.indices.chunks_exact(3) {
            if triangles.len() == MAX_TRIANGLES {
                return Err(too_many(None));
            }
            let mut tri = [0usize; 3];
            for k in 0..3 {
                let i = f[k] as usize;
                if i >= n {
                    return Err(format!(
                        "face {} of object \"{}\" uses vertex {} but there are only {n}",
                        triangles.len() + 1,
                        m.name,
                        i + 1
                    ));
                }
                tri[k] = offset + i;
            }
            triangles.push(tri);
        }
    }
    Ok((vertices, triangles))
}

/// `count`: the exact number when known (a binary STL header), `None` when reading
/// stopped at the limit.
fn too_many(count: Option<usize>) -> String {
    let what = count.map_or_else(|| format!("more than {MAX_TRIANGLES}"), |n| n.to_string());
    format!("has {what} triangles; at most {MAX_TRIANGLES} are supported (simplify the mesh)")
}

/// Checks the parsed mesh and converts it to metres.
fn finish(
    vertices_mm: Vec<[f64; 3]>,
    triangles: Vec<[usize; 3]>,
    scale: f64,
) -> Result<TriangleMesh, String> {
    if triangles.is_empty() {
        return Err("contains no triangles".to_string());
    }
    if triangles.len() > MAX_TRIANGLES {
        return Err(too_many(Some(triangles.len())));
    }
    let mut vertices = Vec::with_capacity(vertices_mm.len());
    // Vertices are named by their coordinates: the readers renumber them, so an index
    // would not match the file.
    for v in &vertices_mm {
        if v.iter().any(|c| !c.is_finite()) {
            return Err(format!("has a vertex with a non-finite coordinate ({} {} {})", v[0], v[1], v[2]));
        }
        let m = Vec3::new(v[0], v[1], v[2]) * (scale * 1e-3);
        if !m.is_finite() {
            return Err(format!(
                "has a vertex ({} {} {}) that overflows when scaled by {scale}",
                v[0], v[1], v[2]
            ));
        }
        vertices.push(m);
    }
    let mut tris = Vec::with_capacity(triangles.len());
    for (k, t) in triangles.iter().enumerate() {
        if let Some(&bad) = t.iter().find(|&&i| i >= vertices.len()) {
            return Err(format!(
                "triangle {} uses vertex {} but there are only {}",
                k + 1,
                bad + 1,
                vertices.len()
            ));
        }
        let idx = |i: usize| u32::try_from(i).map_err(|_| format!("vertex index {i} is too large"));
        tris.push([idx(t[0])?, idx(t[1])?, idx(t[2])?]);
    }
    let (lo, hi) = tris.iter().flatten().fold(
        (Vec3::splat(f64::INFINITY), Vec3::splat(f64::NEG_INFINITY)),
        |(lo, hi), &i| {
            let v = vertices[i as usize];
            (lo.min(v), hi.max(v))
        },
    );
    let diagonal = (hi - lo).length();
    if diagonal > MAX_EXTENT_M * 3f64.sqrt() || (hi - lo).max_element() > MAX_EXTENT_M {
        return Err(format!(
            "is {:.3} m across after scaling by {scale}; at most {MAX_EXTENT_M} m (coordinates are read as mm)",
            (hi - lo).max_element()
        ));
    }
    let area: f64 = tris
        .iter()
        .map(|t| {
            let [a, b, c] = t.map(|i| vertices[i as usize]);
            0.5 * (b - a).cross(c - a).length()
        })
        .sum();
    // relative to the mesh's own size, so the check does not depend on units or scale
    if !(diagonal > 0.0 && area > 1e-12 * diagonal * diagonal) {
        return Err("is degenerate: all its triangles have zero area".to_string());
    }
    check_closed(&vertices_mm, &triangles)?;
    check_solid(&vertices, &tris, diagonal)?;
    Ok(TriangleMesh { vertices, triangles: tris })
}

/// A mesh object must be a closed surface: every edge borders an even number of
/// triangles (two, for a plain surface). Vertices are compared by position, so a file
/// that repeats a vertex (an OBJ with seams, say) is welded first. An open surface has no
/// inside: it cannot be enclosed, and its hull is not the object.
fn check_closed(vertices_mm: &[[f64; 3]], triangles: &[[usize; 3]]) -> Result<(), String> {
    use std::collections::HashMap;
    let key = |i: usize| vertices_mm[i].map(|c| if c == 0.0 { 0u64 } else { c.to_bits() });
    let mut id: HashMap<[u64; 3], usize> = HashMap::new();
    let welded: Vec<[usize; 3]> = triangles
        .iter()
        .map(|t| {
            t.map(|i| {
                let n = id.len();
                *id.entry(key(i)).or_insert(n)
            })
        })
        .collect();
    let edge = |a: usize, b: usize| if a < b { (a, b) } else { (b, a) };
    let mut count: HashMap<(usize, usize), usize> = HashMap::new();
    for t in &welded {
        for k in 0..3 {
            let (a, b) = (t[k], t[(k + 1) % 3]);
            if a != b {
                *count.entry(edge(a, b)).or_insert(0) += 1;
            }
        }
    }
    let open = count.values().filter(|&&n| n % 2 == 1).count();
    if open == 0 {
        return Ok(());
    }
    // the first open edge in file order, for a message that points somewhere
    for (t, orig) in welded.iter().zip(triangles) {
        for k in 0..3 {
            let (a, b) = (t[k], t[(k + 1) % 3]);
            if a != b && count[&edge(a, b)] % 2 == 1 {
                let p = |v: [f64; 3]| format!("({} {} {})", v[0], v[1], v[2]);
                return Err(format!(
                    "is not a closed surface: the edge from {} to {} borders {} triangle(s) ({open} open \
                     edge(s) in all); a mesh object must be watertight",
                    p(vertices_mm[orig[k]]),
                    p(vertices_mm[orig[(k + 1) % 3]]),
                    count[&edge(a, b)]
                ));
            }
        }
    }
    Ok(())
}

/// The vertices of a mesh object must span a volume: a closed but flat mesh (two
/// triangles back to back) has no inside and no convex hull.
fn check_solid(vertices: &[Vec3], triangles: &[[u32; 3]], diagonal: f64) -> Result<(), String> {
    let tol = 1e-9 * diagonal;
    let plane = triangles.iter().find_map(|t| {
        let [a, b, c] = t.map(|i| vertices[i as usize]);
        let n = (b - a).cross(c - a);
        (n.length() > 1e-12 * diagonal * diagonal).then(|| (a, n.normalize()))
    });
    let Some((origin, normal)) = plane else {
        return Err("is degenerate: all its triangles have zero area".to_string());
    };
    let off_plane =
        triangles.iter().flatten().any(|&i| normal.dot(vertices[i as usize] - origin).abs() > tol);
    if off_plane {
        Ok(())
    } else {
        Err("is flat: all its vertices lie in one plane, so it encloses no volume".to_string())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A fresh folder under the system temp dir, removed on drop.
    pub(crate) struct Dir(pub PathBuf);
    impl Dir {
        pub fn new(name: &str) -> Self {
            let p = std::env::temp_dir().join(format!("arcfinger-mesh-{}-{name}", std::process::id()));
            let _ = std::fs::remove_dir_all(&p);
            std::fs::create_dir_all(&p).unwrap();
            Self(p)
        }
        pub fn write(&self, rel: &str, bytes: &[u8]) {
            let p = self.0.join(rel);
            std::fs::create_dir_all(p.parent().unwrap()).unwrap();
            std::fs::write(p, bytes).unwrap();
        }
    }
    impl Drop for Dir {
        fn drop(&mut self) {
            let _ = std::fs::remove_dir_all(&self.0);
        }
    }

    /// A unit tetrahedron (edge 10 mm) as ASCII STL.
    pub(crate) fn tetra_ascii() -> String {
        let v = [[0.0, 0.0, 0.0], [10.0, 0.0, 0.0], [0.0, 10.0, 0.0], [0.0, 0.0, 10.0]];
        let faces = [[0, 2, 1], [0, 1, 3], [0, 3, 2], [1, 2, 3]];
        let mut s = String::from("solid tetra\n");
        for f in faces {
            s.push_str("facet normal 0 0 0\nouter loop\n");
            for i in f {
                let p: [f64; 3] = v[i];
                s.push_str(&format!("vertex {} {} {}\n", p[0], p[1], p[2]));
            }
            s.push_str("endloop\nendfacet\n");
        }
        s.push_str("endsolid tetra\n");
        s
    }

    /// The same tetrahedron as binary STL, with the given 80-byte header start.
    fn tetra_binary(header: &[u8]) -> Vec<u8> {
        let v = [[0.0f32, 0.0, 0.0], [10.0, 0.0, 0.0], [0.0, 10.0, 0.0], [0.0, 0.0, 10.0]];
        let faces = [[0, 2, 1], [0, 1, 3], [0, 3, 2], [1, 2, 3]];
        let mut b = vec![0u8; 80];
        b[..header.len()].copy_from_slice(header);
        b.extend_from_slice(&(faces.len() as u32).to_le_bytes());
        for f in faces {
            b.extend_from_slice(&[0u8; 12]);
            for i in f {
                for c in v[i] {
                    b.extend_from_slice(&c.to_le_bytes());
                }
            }
            b.extend_from_slice(&[0u8; 2]);
        }
        b
    }

    const TETRA_OBJ: &str = "v 0 0 0\nv 10 0 0\nv 0 10 0\nv 0 0 10\nf 1 3 2\nf 1 2 4\nf 1 4 3\nf 2 3 4\n";

    /// Surface area of the tetrahedron with three 10 mm edges at right angles:
    /// three right triangles of 50 mm² plus an equilateral one of side 10 sqrt 2,
    /// (sqrt 3 / 4) 200 = 86.60 mm² (closed form).
    fn area_m2(m: &TriangleMesh) -> f64 {
        m.triangles
            .iter()
            .map(|t| {
                let [a, b, c] = t.map(|i| m.vertices[i as usize]);
                0.5 * (b - a).cross(c - a).length()
            })
            .sum()
    }
    const TETRA_AREA_M2: f64 = (150.0 + 86.602_540_378_443_86) * 1e-6;

    #[test]
    fn ascii_binary_and_obj_give_the_same_tetrahedron_in_metres() {
        let d = Dir::new("formats");
        d.write("m/a.stl", tetra_ascii().as_bytes());
        d.write("m/b.stl", &tetra_binary(b"made by a test"));
        d.write("m/c.stl", &tetra_binary(b"solid but binary"));
        d.write("m/d.obj", TETRA_OBJ.as_bytes());
        d.write("m/e.STL", tetra_ascii().replace("solid tetra", "solid").as_bytes());
        for name in ["m/a.stl", "m/b.stl", "m/c.stl", "m/d.obj", "m/e.STL"] {
            let m = load_mesh(&d.0, name, 1.0).unwrap_or_else(|e| panic!("{name}: {e}"));
            assert_eq!(m.vertices.len(), 4, "{name}");
            assert_eq!(m.triangles.len(), 4, "{name}");
            approx::assert_relative_eq!(area_m2(&m), TETRA_AREA_M2, max_relative = 1e-6);
        }
        // scale 2 doubles lengths and quadruples the area
        let m = load_mesh(&d.0, "m/d.obj", 2.0).unwrap();
        approx::assert_relative_eq!(area_m2(&m), 4.0 * TETRA_AREA_M2, max_relative = 1e-12);
    }

    #[test]
    fn obj_quads_are_triangulated() {
        let d = Dir::new("quads");
        // a closed cube of six quads
        let cube = "v 0 0 0\nv 1 0 0\nv 1 1 0\nv 0 1 0\nv 0 0 1\nv 1 0 1\nv 1 1 1\nv 0 1 1\n\
                    f 1 4 3 2\nf 5 6 7 8\nf 1 2 6 5\nf 2 3 7 6\nf 3 4 8 7\nf 4 1 5 8\n";
        d.write("cube.obj", cube.as_bytes());
        let m = load_mesh(&d.0, "cube.obj", 10.0).unwrap();
        assert_eq!(m.triangles.len(), 12);
        // 6 faces of (10 mm)^2
        approx::assert_relative_eq!(area_m2(&m), 6.0 * 1e-4, max_relative = 1e-12);
    }

    fn err(d: &Dir, rel: &str) -> String {
        load_mesh(&d.0, rel, 1.0).unwrap_err()
    }

    #[test]
    fn bad_paths_are_refused_before_reading() {
        let d = Dir::new("paths");
        d.write("ok.obj", TETRA_OBJ.as_bytes());
        assert!(err(&d, "/etc/passwd.obj").contains("absolute paths are refused"));
        assert!(err(&d, "C:/x.obj").contains("absolute paths are refused"));
        assert!(err(&d, "../ok.obj").contains("`..` is refused"));
        assert!(err(&d, "sub/../../ok.obj").contains("`..` is refused"));
        assert!(err(&d, "sub\\ok.obj").contains("backslash"));
        assert!(err(&d, "").contains("empty"));
        let e = err(&d, "missing.obj");
        assert!(e.starts_with("\"missing.obj\": cannot read") && e.contains("missing.obj"), "{e}");
        assert!(err(&d, "ok.ply").contains("unknown mesh format `.ply`"));
        assert!(err(&d, "ok").contains("no file extension"));
    }

    #[cfg(unix)]
    #[test]
    fn a_symbolic_link_out_of_the_folder_is_refused() {
        let outside = Dir::new("outside");
        outside.write("secret.obj", TETRA_OBJ.as_bytes());
        let d = Dir::new("links");
        std::os::unix::fs::symlink(outside.0.join("secret.obj"), d.0.join("link.obj")).unwrap();
        let e = err(&d, "link.obj");
        assert!(e.contains("outside the scene file's folder"), "{e}");
        // a folder is not a mesh
        std::fs::create_dir_all(d.0.join("dir.obj")).unwrap();
        assert!(err(&d, "dir.obj").contains("not a regular file"));
    }

    #[test]
    fn bad_contents_are_reported() {
        let d = Dir::new("contents");
        d.write("empty.obj", b"# nothing here\n");
        assert!(err(&d, "empty.obj").contains("contains no triangles"));
        d.write("empty.stl", b"solid x\nendsolid x\n");
        assert!(err(&d, "empty.stl").contains("contains no triangles"));
        d.write("nan.obj", TETRA_OBJ.replacen("v 10 0 0", "v nan 0 0", 1).as_bytes());
        assert!(
            err(&d, "nan.obj").contains("a vertex with a non-finite coordinate (NaN 0 0)"),
            "{}",
            err(&d, "nan.obj")
        );
        d.write("index.obj", format!("{TETRA_OBJ}f 1 2 9\n").as_bytes());
        assert!(err(&d, "index.obj").contains("out of bounds"), "{}", err(&d, "index.obj"));
        d.write("flat.obj", b"v 0 0 0\nv 1 0 0\nv 2 0 0\nf 1 2 3\n");
        assert!(err(&d, "flat.obj").contains("degenerate"));
        d.write("point.obj", b"v 1 1 1\nf 1 1 1\n");
        assert!(err(&d, "point.obj").contains("degenerate"));
        d.write("garbage.obj", b"v 1 x 1\n");
        assert!(err(&d, "garbage.obj").contains("not a valid OBJ file"));
        let mut short = tetra_binary(b"x");
        short.truncate(120);
        d.write("short.stl", &short);
        assert!(err(&d, "short.stl").contains("truncated"), "{}", err(&d, "short.stl"));
        d.write("tiny.stl", b"abc");
        assert!(err(&d, "tiny.stl").contains("not an STL file"));
        d.write("bad.stl", b"solid x\nfacet normal 0 0 0\nouter loop\nvertex 1 2\n");
        assert!(err(&d, "bad.stl").contains("not a valid STL file"), "{}", err(&d, "bad.stl"));
        let mut huge = tetra_binary(b"x");
        huge[80..84].copy_from_slice(&(MAX_TRIANGLES as u32 + 1).to_le_bytes());
        d.write("huge.stl", &huge);
        assert!(
            err(&d, "huge.stl").contains("has 200001 triangles; at most 200000"),
            "{}",
            err(&d, "huge.stl")
        );
        // an OBJ is counted while it is read
        let mut many = String::from("v 0 0 0\nv 1 0 0\nv 0 1 0\n");
        for _ in 0..=MAX_TRIANGLES {
            many.push_str("f 1 2 3\n");
        }
        d.write("many.obj", many.as_bytes());
        assert!(err(&d, "many.obj").contains("has more than 200000 triangles"), "{}", err(&d, "many.obj"));
        // a tetrahedron without its last face: open along three edges
        d.write("open.obj", TETRA_OBJ.replace("f 2 3 4\n", "").as_bytes());
        let e = err(&d, "open.obj");
        assert!(
            e.contains("is not a closed surface: the edge from (0 10 0) to (10 0 0) borders 1 triangle(s) (3 open edge(s) in all)"),
            "{e}"
        );
        // two triangles back to back: closed, but flat
        d.write("flat2.obj", b"v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\nf 1 3 2\n");
        assert!(
            err(&d, "flat2.obj").contains("is flat: all its vertices lie in one plane"),
            "{}",
            err(&d, "flat2.obj")
        );
        // a closed OBJ that repeats a vertex per face is welded, so it is closed
        let split = "v 0 0 0\nv 10 0 0\nv 0 10 0\nv 0 0 0\nv 10 0 0\nv 0 0 10\nv 0 0 0\nv 0 0 10\nv 0 10 0\n\
                     v 10 0 0\nv 0 10 0\nv 0 0 10\nf 1 3 2\nf 4 5 6\nf 7 8 9\nf 10 11 12\n";
        d.write("split.obj", split.as_bytes());
        assert!(load_mesh(&d.0, "split.obj", 1.0).is_ok());
        d.write("big.obj", TETRA_OBJ.as_bytes());
        let e = load_mesh(&d.0, "big.obj", 1e4).unwrap_err();
        assert!(e.contains("m across after scaling"), "{e}");
    }
}
