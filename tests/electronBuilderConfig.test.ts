// electron-builder.yml is checked here, not by building: packaging downloads Electron and its
// tools from outside the npm registry. The schema is the one electron-builder itself validates
// configurations against (app-builder-lib's scheme.json, a JSON Schema draft-07 document),
// compiled with Ajv 8 as electron-builder does (allErrors, strict: false), but without its
// type coercion, so a string where a boolean belongs fails here.
// Fuse names and values: Electron's "Fuses" and "Security" tutorials, @electron/fuses option
// names as exposed by electron-builder's electronFuses.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import Ajv, { type ValidateFunction } from 'ajv';
import { beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'yaml';

const repoRoot = path.resolve(__dirname, '..');
const requireFromHere = createRequire(path.join(repoRoot, 'package.json'));
// app-builder-lib is electron-builder's own dependency: resolve it the way electron-builder does.
const requireFromBuilder = createRequire(requireFromHere.resolve('electron-builder'));
const schemaPath = requireFromBuilder.resolve('app-builder-lib/scheme.json');

type Config = Record<string, unknown>;

function loadConfig(): Config {
  const parsed: unknown = parse(readFileSync(path.join(repoRoot, 'electron-builder.yml'), 'utf8'));
  if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) {
    throw new TypeError('electron-builder.yml must hold a mapping at the top level');
  }
  return parsed as Config;
}

describe('electron-builder.yml', () => {
  let validate: ValidateFunction;
  let config: Config;

  beforeAll(() => {
    const schema = JSON.parse(readFileSync(schemaPath, 'utf8')) as Record<string, unknown>;
    const ajv = new Ajv({ allErrors: true, strict: false });
    validate = ajv.compile(schema);
    config = loadConfig();
  });

  it('is pinned to electron-builder 26.17.0, whose schema is used', () => {
    const builderPackage = JSON.parse(readFileSync(requireFromHere.resolve('electron-builder/package.json'), 'utf8')) as {
      version: string;
    };
    expect(builderPackage.version).toBe('26.17.0');
  });

  it("validates against electron-builder's configuration schema", () => {
    const ok = validate(config);
    expect(validate.errors ?? [], JSON.stringify(validate.errors, null, 2)).toEqual([]);
    expect(ok).toBe(true);
  });

  it('sets the Electron fuses from the security checklist', () => {
    expect(config['electronFuses']).toEqual({
      runAsNode: false,
      enableNodeOptionsEnvironmentVariable: false,
      enableNodeCliInspectArguments: false,
      onlyLoadAppFromAsar: true,
      enableEmbeddedAsarIntegrityValidation: true,
      enableCookieEncryption: true,
      grantFileProtocolExtraPrivileges: false,
    });
  });

  it('packs only the bundle and package.json into an asar, with the demo captures as resources', () => {
    expect(config['appId']).toBe('org.statorscope.app');
    expect(config['productName']).toBe('Statorscope');
    expect(config['asar']).toBe(true);
    expect(config['files']).toEqual(['dist/**', 'package.json']);
    expect(config['extraResources']).toEqual([{ from: 'sample-captures', to: 'sample-captures', filter: ['**/*'] }]);
    // electron-builder's default output folder is dist/, where our bundle lives.
    expect((config['directories'] as Config | undefined)?.['output']).not.toBe('dist');
  });

  it('has targets for linux, win and mac', () => {
    for (const platform of ['linux', 'win', 'mac']) {
      const target = (config[platform] as Config | undefined)?.['target'];
      expect(Array.isArray(target) && target.length > 0, platform).toBe(true);
    }
  });

  describe('negative controls: the schema check can fail', () => {
    it('rejects an unknown top-level key', () => {
      expect(validate({ ...config, electronFusez: { runAsNode: false } })).toBe(false);
      expect(validate.errors?.some((e) => e.keyword === 'additionalProperties')).toBe(true);
    });

    it('rejects a wrong type for a fuse', () => {
      const fuses = config['electronFuses'] as Config;
      expect(validate({ ...config, electronFuses: { ...fuses, runAsNode: 'no' } })).toBe(false);
      expect(validate.errors?.some((e) => e.instancePath === '/electronFuses/runAsNode' && e.keyword === 'type')).toBe(
        true,
      );
    });

    it('rejects a fuse name the schema does not know', () => {
      const fuses = config['electronFuses'] as Config;
      expect(validate({ ...config, electronFuses: { ...fuses, runAsNodeX: false } })).toBe(false);
    });

    it('rejects a wrong type for asar', () => {
      expect(validate({ ...config, asar: 'yes' })).toBe(false);
    });
  });
});
