import { applyDecorators } from '@nestjs/common';
import { ValidateIf, ValidationOptions, registerDecorator } from 'class-validator';

/**
 * The one rule for fields a request may leave out (docs/security.md, "Optional and nullable fields"):
 * - `@Optional()`: absent keeps the current value (or the default); `null` is refused by name, because
 *   the field cannot be empty. (`@IsOptional()` let null through to a NOT NULL column: 500.)
 * - `@Nullable()`: absent keeps the current value; `null` clears it; any other value is validated.
 * Request DTOs use these two instead of class-validator's `@IsOptional()`.
 */
export function Optional(): PropertyDecorator {
  return applyDecorators(ValidateIf((_obj: object, value: unknown) => value !== undefined), NotNull());
}

export function Nullable(): PropertyDecorator {
  return applyDecorators(ValidateIf((_obj: object, value: unknown) => value !== undefined && value !== null));
}

function NotNull(options?: ValidationOptions): PropertyDecorator {
  return (target: object, propertyName: string | symbol) =>
    registerDecorator({
      name: 'notNull',
      target: target.constructor,
      propertyName: propertyName as string,
      options: {
        message: `${String(propertyName)} cannot be null: leave it out to keep the current value, or send a value`,
        ...options,
      },
      validator: { validate: (value: unknown) => value !== null },
    });
}
