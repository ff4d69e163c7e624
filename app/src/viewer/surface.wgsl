// The viewer's surfaces when shadows are off: bevy's own lighting functions (Burley
// diffuse and the GGX specular of each directional light, the ambient term, exposure,
// then the in-shader tonemapping and dithering), called directly instead of through the
// standard material's shader. That shader also runs the shadow-map lookups of every
// light kind and the clustered loops; a CPU rasterizer (llvmpipe) evaluates both sides
// of a branch and every loop body at least once, so with shadows off it paid for them
// on every pixel anyway. With no shadows, no point or spot lights, no textures and no
// fog (the viewer has none of them) the result is the standard material's.

#import bevy_pbr::{
    forward_io::{VertexOutput, FragmentOutput},
    mesh_view_bindings as view_bindings,
    pbr_types,
    pbr_functions,
    lighting,
    lighting::LAYER_BASE,
    ambient,
}

struct SurfaceParams {
    // linear RGB and alpha
    base_color: vec4<f32>,
    // x: perceptual roughness, y: reflectance, z: 1 when alpha-blended
    params: vec4<f32>,
}

@group(#{MATERIAL_BIND_GROUP}) @binding(0) var<uniform> surface: SurfaceParams;

fn lit(in: pbr_types::PbrInput) -> vec4<f32> {
    let base = in.material.base_color;
    let perceptual_roughness = in.material.perceptual_roughness;
    let roughness = lighting::perceptualRoughnessToRoughness(perceptual_roughness);
    let metallic = in.material.metallic;
    let NdotV = max(dot(in.N, in.V), 0.0001);
    let diffuse_color = pbr_functions::calculate_diffuse_color(base.rgb, metallic, 0.0, 0.0);
    let F0 = pbr_functions::calculate_F0(base.rgb, metallic, in.material.reflectance);

    var input: lighting::LightingInput;
    input.layers[LAYER_BASE].NdotV = NdotV;
    input.layers[LAYER_BASE].N = in.N;
    input.layers[LAYER_BASE].R = reflect(-in.V, in.N);
    input.layers[LAYER_BASE].perceptual_roughness = perceptual_roughness;
    input.layers[LAYER_BASE].roughness = roughness;
    input.P = in.world_position.xyz;
    input.V = in.V;
    input.diffuse_color = diffuse_color;
    input.metallic = metallic;
    input.F0_dielectric = pbr_functions::calculate_F0_dielectric(in.material.reflectance);
    input.F0_metallic = base.rgb;
    input.F_ab = lighting::F_AB(perceptual_roughness, NdotV);

    var direct = vec3<f32>(0.0);
    let n = view_bindings::lights.n_directional_lights;
    for (var i: u32 = 0u; i < n; i = i + 1u) {
        direct += lighting::directional_light(i, &input, true);
    }
    let indirect = ambient::ambient_light(
        in.world_position, in.N, in.V, NdotV, diffuse_color, F0, perceptual_roughness, in.diffuse_occlusion,
    );
    return vec4<f32>(view_bindings::view.exposure * (direct + indirect), base.a);
}

@fragment
fn fragment(vertex: VertexOutput, @builtin(front_facing) is_front: bool) -> FragmentOutput {
    var pbr_input = pbr_types::pbr_input_new();
    pbr_input.material.base_color = surface.base_color;
    pbr_input.material.perceptual_roughness = surface.params.x;
    pbr_input.material.reflectance = vec3<f32>(surface.params.y);
    pbr_input.material.metallic = 0.0;
    if (surface.params.z > 0.5) {
        pbr_input.material.flags = pbr_types::STANDARD_MATERIAL_FLAGS_ALPHA_MODE_BLEND;
    } else {
        pbr_input.material.flags = pbr_types::STANDARD_MATERIAL_FLAGS_ALPHA_MODE_OPAQUE;
    }
    pbr_input.frag_coord = vertex.position;
    pbr_input.world_position = vertex.world_position;
    pbr_input.is_orthographic = view_bindings::view.clip_from_view[3].w == 1.0;
    pbr_input.world_normal = pbr_functions::prepare_world_normal(vertex.world_normal, false, is_front);
    pbr_input.N = normalize(pbr_input.world_normal);
    pbr_input.V = pbr_functions::calculate_view(vertex.world_position, pbr_input.is_orthographic);

    var out: FragmentOutput;
    out.color = pbr_functions::main_pass_post_lighting_processing(pbr_input, lit(pbr_input));
    return out;
}
