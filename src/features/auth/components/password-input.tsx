import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { TextField, type TextFieldProps } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';

/** A password field with a show/hide button (typing blind with wet hands is hard). */
export function PasswordInput(props: Omit<TextFieldProps, 'type' | 'trailing'>) {
  const { t } = useTranslation();
  const [visible, setVisible] = useState(false);
  return (
    <TextField
      {...props}
      type={visible ? 'text' : 'password'}
      autoCapitalize="none"
      autoCorrect="off"
      spellCheck={false}
      trailing={
        <Button
          variant="ghost"
          size="icon"
          aria-pressed={visible}
          aria-label={visible ? t('auth.hidePassword') : t('auth.showPassword')}
          onClick={() => setVisible((v) => !v)}
        >
          <Icon name={visible ? 'eyeOff' : 'eye'} />
        </Button>
      }
    />
  );
}
